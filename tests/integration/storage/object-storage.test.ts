// Both storage drivers behave the same: upload, read back, delete, and refuse another organisation's key.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DiskStorage } from '@/lib/storage/disk';
import { S3Storage } from '@/lib/storage/s3';
import { scopedStorage, type ObjectStorage } from '@/lib/storage';
import { AppError } from '@/lib/errors';
import { newId } from '@/lib/ids';
import { startS3Fake, type S3Fake } from '@/scripts/fakes/s3-fake';

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'hearthmark-storage-'));
let fake: S3Fake;
let s3: S3Storage;

beforeAll(async () => {
  fake = await startS3Fake({ dir: path.join(work, 's3'), bucket: 'hearthmark-test' });
  s3 = new S3Storage({
    bucket: fake.bucket,
    region: 'us-east-1',
    endpoint: fake.endpoint,
    accessKeyId: fake.settings.S3_ACCESS_KEY_ID,
    secretAccessKey: fake.settings.S3_SECRET_ACCESS_KEY,
    forcePathStyle: true,
  });
});

afterAll(async () => {
  s3?.close();
  await fake?.close();
  fs.rmSync(work, { recursive: true, force: true });
});

const drivers: Array<[string, () => ObjectStorage]> = [
  ['disk', () => new DiskStorage(path.join(work, 'disk'))],
  ['s3', () => s3],
];

describe.each(drivers)('%s storage', (_name, driver) => {
  const orgA = newId();
  const orgB = newId();
  // A small JPEG-like payload with every byte value, to catch any text re-encoding on the way.
  const bytes = new Uint8Array(Array.from({ length: 512 }, (_, i) => i % 256));

  it('stores, reads back and deletes an object under the organisation prefix', async () => {
    const store = scopedStorage(driver(), orgA);
    const key = store.keyFor('photos', newId(), 'front.jpg');
    expect(key.startsWith(`${orgA}/`)).toBe(true);
    expect(await store.exists(key)).toBe(false);
    expect(await store.get(key)).toBeNull();

    await store.put(key, bytes, 'image/jpeg');
    expect(await store.exists(key)).toBe(true);
    const back = await store.get(key);
    expect(back?.contentType).toBe('image/jpeg');
    expect(Buffer.from(back!.bytes).equals(Buffer.from(bytes))).toBe(true);

    await store.put(key, new Uint8Array([1, 2, 3]), 'application/pdf');
    const replaced = await store.get(key);
    expect(Array.from(replaced!.bytes)).toEqual([1, 2, 3]);
    expect(replaced!.contentType).toBe('application/pdf');

    await store.delete(key);
    expect(await store.exists(key)).toBe(false);
    expect(await store.get(key)).toBeNull();
    await expect(store.delete(key)).resolves.toBeUndefined();
  });

  it("refuses another organisation's key on every operation", async () => {
    const mine = scopedStorage(driver(), orgA);
    const theirs = scopedStorage(driver(), orgB);
    const theirKey = theirs.keyFor('certificates', 'c-1.pdf');
    await theirs.put(theirKey, bytes, 'application/pdf');

    for (const attempt of [
      () => mine.get(theirKey),
      () => mine.exists(theirKey),
      () => mine.delete(theirKey),
      () => mine.put(theirKey, bytes, 'application/pdf'),
    ]) {
      await expect(attempt()).rejects.toMatchObject({ code: 'forbidden', status: 403 });
    }
    // Their object is untouched by the refused delete and overwrite.
    expect(Buffer.from((await theirs.get(theirKey))!.bytes).equals(Buffer.from(bytes))).toBe(true);
  });

  it('refuses keys that try to climb out of the prefix', async () => {
    const store = scopedStorage(driver(), orgA);
    for (const key of [`${orgA}/../${orgB}/x.pdf`, `${orgA}/./x`, `${orgA}/.types/x`, `${orgA}/`, `${orgA}//x`, `${orgA}/a\\b`]) {
      await expect(store.get(key)).rejects.toBeInstanceOf(AppError);
    }
    expect(() => store.keyFor('..', 'x')).toThrow(AppError);
  });
});

describe('driver selection', () => {
  it('follows STORAGE_DRIVER and the S3 settings, with no code change', async () => {
    const { storageFor, objectStorage, fileStore } = await import('@/lib/storage');
    const { resetEnvCache } = await import('@/lib/env');
    const saved = { ...process.env };
    try {
      Object.assign(process.env, fake.settings);
      resetEnvCache();
      expect(objectStorage()).toBeInstanceOf(S3Storage);
      const store = storageFor(newId());
      const key = store.keyFor('photos', 'p.jpg');
      await store.put(key, new Uint8Array([7]), 'image/jpeg');
      expect(Array.from((await s3.get(key))!.bytes)).toEqual([7]);
      // The field app's photo store rides on the same configured driver.
      const photoKey = `${newId()}/visit-1/${newId()}.jpg`;
      await fileStore().put(photoKey, new Uint8Array([9, 9]));
      expect((await s3.get(photoKey))?.contentType).toBe('image/jpeg');
      expect(Array.from((await fileStore().get(photoKey))!)).toEqual([9, 9]);
      await fileStore().remove(photoKey);
      expect(await s3.exists(photoKey)).toBe(false);

      process.env.STORAGE_DRIVER = 'disk';
      resetEnvCache();
      expect(objectStorage()).toBeInstanceOf(DiskStorage);
    } finally {
      for (const name of Object.keys(fake.settings)) {
        if (saved[name] === undefined) delete process.env[name];
        else process.env[name] = saved[name];
      }
      resetEnvCache();
    }
  });
});
