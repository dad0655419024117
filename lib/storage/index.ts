import 'server-only';
// Photos and PDFs: one storage interface, the driver chosen by settings (STORAGE_DRIVER=disk|s3).
// Callers always go through storageFor(organisationId) (or fileStore() for server-made keys), which
// only accept keys under an organisation's prefix, so a key can never reach another organisation's
// file or climb out of the upload folder.
//
// Files reach the browser by streaming through our own route handlers, never by signed S3 URLs:
// every download then passes the same session, role and organisation check as the rest of the API,
// access ends the moment a user is deactivated (a signed URL stays valid until it expires), the
// bucket can stay private and unreachable from the internet, and disk and S3 behave identically.
// Photos (compressed on the phone) and certificates are small, so the extra hop costs little.
import path from 'node:path';
import { env } from '@/lib/env';
import { AppError } from '@/lib/errors';
import { DiskStorage } from './disk';
import { S3Storage } from './s3';
import { isValidKey, type ObjectStorage, type StoredObject } from './types';

export type { ObjectStorage, StoredObject };

export type OrganisationStorage = ObjectStorage & {
  readonly organisationId: string;
  /** A key inside this organisation, e.g. keyFor('photos', visitId, `${photoId}.jpg`). */
  keyFor(...segments: string[]): string;
};

/** Wraps a driver so that it refuses keys outside `<organisationId>/`. Exported for tests. */
export function scopedStorage(driver: ObjectStorage, organisationId: string): OrganisationStorage {
  if (!isValidKey(`${organisationId}/x`)) throw new AppError('bad_request', 'Invalid organisation id for storage');
  const prefix = `${organisationId}/`;
  const check = (key: string): string => {
    if (!key.startsWith(prefix)) throw new AppError('forbidden', 'This file belongs to another organisation');
    if (!isValidKey(key)) throw new AppError('bad_request', 'Invalid file key');
    return key;
  };
  return {
    organisationId,
    keyFor: (...segments) => check(prefix + segments.join('/')),
    // async, so a refused key surfaces as a rejected promise like any other storage failure.
    put: async (key, bytes, contentType) => driver.put(check(key), bytes, contentType),
    get: async (key) => driver.get(check(key)),
    delete: async (key) => driver.delete(check(key)),
    exists: async (key) => driver.exists(check(key)),
  };
}

const holder = globalThis as unknown as { __hearthmarkStorage?: { signature: string; driver: ObjectStorage } };

/** The driver chosen by the settings, built once (tests that change settings get a new one). */
export function objectStorage(): ObjectStorage {
  const e = env();
  const settings =
    e.STORAGE_DRIVER === 's3'
      ? {
          driver: 's3' as const,
          bucket: e.S3_BUCKET as string, // loadEnv() refuses s3 without a bucket
          region: e.S3_REGION,
          endpoint: e.S3_ENDPOINT,
          accessKeyId: e.S3_ACCESS_KEY_ID,
          secretAccessKey: e.S3_SECRET_ACCESS_KEY,
          forcePathStyle: e.S3_FORCE_PATH_STYLE === 'true',
        }
      : { driver: 'disk' as const, root: path.resolve(e.UPLOAD_DIR) };
  const signature = JSON.stringify(settings);
  if (holder.__hearthmarkStorage?.signature !== signature) {
    const driver = settings.driver === 's3' ? new S3Storage(settings) : new DiskStorage(settings.root);
    holder.__hearthmarkStorage = { signature, driver };
  }
  return holder.__hearthmarkStorage.driver;
}

/** Storage for one organisation's files; the way app code should reach stored objects. */
export function storageFor(organisationId: string): OrganisationStorage {
  return scopedStorage(objectStorage(), organisationId);
}

// The field app's photo store: keys the server makes itself (organisation/visit/uuid.ext), with the
// content type following from the extension. Backed by the same configured driver as storageFor().
export interface FileStore {
  put(key: string, bytes: Uint8Array): Promise<void>;
  /** null when there is no such file. */
  get(key: string): Promise<Buffer | null>;
  remove(key: string): Promise<void>;
}

const KEY_PATTERN = /^[a-z0-9-]+(\/[a-z0-9-]+)*\.(jpg|png|webp)$/;
const CONTENT_TYPES: Record<string, string> = { jpg: 'image/jpeg', png: 'image/png', webp: 'image/webp' };

export function checkKey(key: string): string {
  if (!KEY_PATTERN.test(key)) throw new Error(`storage key not allowed: ${key}`);
  return key;
}

function storeOver(driver: () => ObjectStorage): FileStore {
  return {
    async put(key, bytes) {
      await driver().put(checkKey(key), bytes, CONTENT_TYPES[key.slice(key.lastIndexOf('.') + 1)]!);
    },
    async get(key) {
      const found = await driver().get(checkKey(key));
      return found ? Buffer.from(found.bytes) : null;
    },
    async remove(key) {
      await driver().delete(checkKey(key));
    },
  };
}

export function diskStore(root: string): FileStore {
  const driver = new DiskStorage(root);
  return storeOver(() => driver);
}

/** The configured store (disk or S3, see STORAGE_DRIVER). */
export function fileStore(): FileStore {
  return storeOver(objectStorage);
}
