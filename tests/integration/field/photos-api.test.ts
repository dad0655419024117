// POST /api/v1/photos and GET /api/v1/photos/[id]: the type is read from the bytes, size is capped,
// location metadata is stripped, files are served only to those who may see the visit.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { freshDatabase } from '../../support/db';
import { get, noParams, params } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import * as photosRoute from '@/app/api/v1/photos/route';
import * as photoRoute from '@/app/api/v1/photos/[id]/route';
import { MAX_PHOTO_BYTES } from '@/lib/validations/inspection';
import { applianceAt, as, office, otherOffice, priya, tomasz, visits } from './helpers';

const VISIT = visits.priyaToday;
const APPLIANCE = applianceAt(visits.priyaSite, 0);

function upload(file: Blob, fields: Record<string, string>, filename = 'photo.jpg') {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  form.set('file', file, filename);
  return photosRoute.POST(new Request('http://localhost:3000/api/v1/photos', { method: 'POST', body: form }), noParams);
}

const meta = (id = randomUUID()) => ({ id, visitId: VISIT, purpose: 'appliance', applianceId: APPLIANCE, caption: 'Flue terminal', takenAt: new Date().toISOString() });

/** A JPEG carrying camera details and a GPS position, as a phone would write it. */
async function jpegWithGps(): Promise<Buffer> {
  return sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 180, g: 90, b: 40 } } })
    .jpeg()
    .withExif({
      IFD0: { Make: 'HearthTestCam', Model: 'Field 1' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 1234/100', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 4000/100' },
    })
    .toBuffer();
}

// EXIF tag 0x8825 points at the GPS block; it appears in either byte order.
const hasGpsPointer = (exif: Buffer) => exif.includes(Buffer.from([0x88, 0x25])) || exif.includes(Buffer.from([0x25, 0x88]));

beforeAll(async () => {
  await freshDatabase({ seed: true });
});
afterAll(closeDb);
beforeEach(() => as(priya));

describe('POST /api/v1/photos', () => {
  it('strips every piece of metadata, location included, and serves the photo with nosniff', async () => {
    const original = await jpegWithGps();
    const before = await sharp(original).metadata();
    expect(before.exif && hasGpsPointer(before.exif)).toBe(true);

    const m = meta();
    const res = await upload(new Blob([new Uint8Array(original)], { type: 'image/jpeg' }), m);
    expect(res.status).toBe(201);
    expect((await res.json()).photo).toMatchObject({ id: m.id, width: 640, height: 480 });

    const served = await photoRoute.GET(get(`/api/v1/photos/${m.id}`), params({ id: m.id }));
    expect(served.status).toBe(200);
    expect(served.headers.get('x-content-type-options')).toBe('nosniff');
    expect(served.headers.get('content-type')).toBe('image/jpeg');
    const bytes = Buffer.from(await served.arrayBuffer());
    const after = await sharp(bytes).metadata();
    expect(after.format).toBe('jpeg');
    expect(after.exif).toBeUndefined();
    expect(after.xmp).toBeUndefined();
    expect(bytes.includes(Buffer.from('HearthTestCam'))).toBe(false);

    const row = await db()('photos').where({ id: m.id }).first();
    expect(row.storage_key.startsWith(`${row.organisation_id}/`)).toBe(true);
    expect(row.storage_key).not.toContain('public');
  });

  it('an HTML file renamed .jpg is refused by its content, whatever it claims', async () => {
    const html = new Blob(['<!doctype html><html><body><script>alert(1)</script></body></html>'], { type: 'image/jpeg' });
    const m = meta();
    const res = await upload(html, m, 'holiday.jpg');
    expect(res.status).toBe(415);
    expect((await res.json()).error).toMatchObject({ code: 'unsupported_media_type', fields: { file: expect.any(String) } });
    expect(await db()('photos').where({ id: m.id }).first()).toBeUndefined();
  });

  it('an oversized file is refused with 413', async () => {
    const big = new Blob([new Uint8Array(MAX_PHOTO_BYTES + 1)], { type: 'image/jpeg' });
    const res = await upload(big, meta());
    expect(res.status).toBe(413);
  });

  it('a resent photo id returns the stored photo instead of a second copy', async () => {
    const m = meta();
    const file = new Blob([new Uint8Array(await jpegWithGps())], { type: 'image/jpeg' });
    expect((await upload(file, m)).status).toBe(201);
    const again = await upload(file, m);
    expect(again.status).toBe(200);
    expect((await again.json()).duplicate).toBe(true);
    expect(await db()('photos').where({ id: m.id })).toHaveLength(1);
  });

  it("bad details → 422 naming the field; another engineer's visit → 404", async () => {
    const file = new Blob([new Uint8Array(await jpegWithGps())], { type: 'image/jpeg' });
    const bad = await upload(file, { ...meta(), purpose: 'finding' });
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields.findingId).toBeDefined();
    const foreign = await upload(file, { ...meta(), visitId: visits.tomaszToday, applianceId: applianceAt(10, 0) });
    expect(foreign.status).toBe(404);
  });
});

describe('GET /api/v1/photos/[id]', () => {
  it('only the engineer of the visit and the office of the organisation may see it', async () => {
    const m = meta();
    expect((await upload(new Blob([new Uint8Array(await jpegWithGps())], { type: 'image/jpeg' }), m)).status).toBe(201);
    as(tomasz);
    expect((await photoRoute.GET(get('/x'), params({ id: m.id }))).status).toBe(404);
    as(otherOffice);
    expect((await photoRoute.GET(get('/x'), params({ id: m.id }))).status).toBe(404);
    as(office);
    expect((await photoRoute.GET(get('/x'), params({ id: m.id }))).status).toBe(200);
  });
});
