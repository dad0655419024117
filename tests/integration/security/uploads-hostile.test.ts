// Photo uploads against hostile files, completing tests/integration/field/photos-api.test.ts (which
// covers EXIF/GPS stripping, an HTML file named .jpg, 5 MB and a resent id): zero bytes, wrong magic,
// SVG / HTML / script / PDF dressed as images, polyglots, truncated and bomb images, path-traversal
// names and ids. Refusals are 4xx with the error shape and write nothing; an accepted photo is a fresh
// JPEG with no metadata, stored under its id, and served with nosniff only to those allowed.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { as, callRoute, discoverIds, loadRoute, people, prepareSecurityData, rowCounts, type Ids } from '../../security/fixtures';
import { MAX_PHOTO_BYTES } from '@/lib/validations/inspection';

let ids: Ids;
let applianceId = '';
const tally = { tried: 0, held: 0 };

async function upload(input: { bytes: Uint8Array; filename?: string; type?: string; meta?: Record<string, string>; contentLength?: string }) {
  const form = new FormData();
  const meta = { id: randomUUID(), visitId: ids.priyaVisit, purpose: 'appliance', applianceId, caption: 'Boiler', ...input.meta };
  for (const [k, v] of Object.entries(meta)) form.set(k, v);
  form.set('file', new Blob([new Uint8Array(input.bytes)], { type: input.type ?? 'image/jpeg' }), input.filename ?? 'photo.jpg');
  const mod = await loadRoute('photos');
  const req = new Request('http://localhost:3000/api/v1/photos', { method: 'POST', body: form, headers: input.contentLength ? { 'content-length': input.contentLength } : {} });
  const res = await mod.POST!(req, { params: Promise.resolve({}) });
  return { status: res.status, body: (await res.json()) as { error?: { code: string; message: string }; photo?: { id: string } }, id: meta.id };
}

const text = (s: string) => new TextEncoder().encode(s);
const jpeg = (w = 64, h = 48) => sharp({ create: { width: w, height: h, channels: 3, background: { r: 200, g: 40, b: 40 } } }).jpeg().toBuffer();
const concat = (...parts: Uint8Array[]) => Buffer.concat(parts.map((p) => Buffer.from(p)));

function crc32(bytes: Uint8Array): number {
  let c = ~0;
  for (const b of bytes) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
  }
  return ~c >>> 0;
}

/** A tiny real PNG whose header (with a correct checksum) claims a huge size. */
async function pngClaiming(width: number, height: number): Promise<Buffer> {
  const png = Buffer.from(await sharp({ create: { width: 1, height: 1, channels: 3, background: { r: 0, g: 0, b: 0 } } }).png().toBuffer());
  png.writeUInt32BE(width, 16);
  png.writeUInt32BE(height, 20);
  png.writeUInt32BE(crc32(png.subarray(12, 29)), 29);
  return png;
}

const SVG = '<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><script>alert(document.cookie)</script></svg>';
const HTML = '<!doctype html><html><body><script>fetch("/api/v1/me")</script></body></html>';

type Hostile = { name: string; make: () => Promise<{ bytes: Uint8Array; filename?: string; type?: string; meta?: Record<string, string>; contentLength?: string }>; status: number[] };

const REFUSED: Hostile[] = [
  { name: 'zero bytes', make: async () => ({ bytes: new Uint8Array(0) }), status: [422] },
  { name: 'one byte', make: async () => ({ bytes: new Uint8Array([0xff]) }), status: [415] },
  { name: 'random bytes named .jpg', make: async () => ({ bytes: new Uint8Array(Array.from({ length: 4096 }, (_, i) => (i * 7919) % 256)) }), status: [415] },
  { name: 'SVG with script named .jpg', make: async () => ({ bytes: text(SVG) }), status: [415] },
  { name: 'SVG sent as image/svg+xml', make: async () => ({ bytes: text(SVG), filename: 'x.svg', type: 'image/svg+xml' }), status: [415] },
  { name: 'HTML named .png', make: async () => ({ bytes: text(HTML), filename: 'x.png', type: 'image/png' }), status: [415] },
  { name: 'JavaScript named .jpeg', make: async () => ({ bytes: text('alert(document.cookie)//'.repeat(40)), filename: 'x.jpeg' }), status: [415] },
  { name: 'PDF named .jpg', make: async () => ({ bytes: text('%PDF-1.7\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF') }), status: [415] },
  { name: 'GIF (not accepted)', make: async () => ({ bytes: Buffer.from('R0lGODlhAQABAIAAAAAAAP///yH5BAEAAAAALAAAAAABAAEAAAIBRAA7', 'base64'), filename: 'x.gif', type: 'image/gif' }), status: [415] },
  { name: 'JPEG magic followed by HTML', make: async () => ({ bytes: concat(new Uint8Array([0xff, 0xd8, 0xff, 0xe0]), text(HTML)) }), status: [415] },
  { name: 'truncated JPEG', make: async () => ({ bytes: (await jpeg(400, 300)).subarray(0, 300) }), status: [415] },
  { name: 'PNG declaring 40 000 × 40 000 pixels (a decompression bomb)', make: async () => ({ bytes: await pngClaiming(40_000, 40_000), filename: 'bomb.png', type: 'image/png' }), status: [415] },
  { name: 'over the size limit', make: async () => ({ bytes: concat(await jpeg(), new Uint8Array(MAX_PHOTO_BYTES + 1)) }), status: [413] },
  { name: 'declared length over the limit', make: async () => ({ bytes: await jpeg(), contentLength: String(MAX_PHOTO_BYTES * 4) }), status: [413] },
  { name: 'path traversal in the photo id', make: async () => ({ bytes: await jpeg(), meta: { id: '../../../etc/passwd' } }), status: [422] },
  { name: 'path traversal in the visit id', make: async () => ({ bytes: await jpeg(), meta: { visitId: '../../other-org' } }), status: [422] },
  { name: 'encoded traversal in the photo id', make: async () => ({ bytes: await jpeg(), meta: { id: '..%2F..%2Fx' } }), status: [422] },
  // PostgreSQL refuses NUL in text columns; the route refuses it first, on both engines, naming the field.
  { name: 'NUL character in the caption', make: async () => ({ bytes: await jpeg(), meta: { caption: 'Boiler\u0000<script>' } }), status: [422] },
  { name: "another engineer's visit", make: async () => ({ bytes: await jpeg(), meta: { visitId: (await db()('visits').where({ engineer_id: people().otherEngineer.id }).first('id')).id as string } }), status: [404] },
];

// The seed takes minutes on a busy machine, beyond the default hook timeout.
beforeAll(async () => {
  const knex = await freshDatabase({ seed: true });
  await prepareSecurityData(knex);
  ids = await discoverIds(knex);
  applianceId = (await knex('appliances as a').join('visits as v', 'v.site_id', 'a.site_id').where('v.id', ids.priyaVisit).first('a.id')).id as string;
}, 240_000);
afterAll(async () => {
  console.log(`hostile uploads: tried ${tally.tried}, held ${tally.held}`);
  await closeDb();
});

describe('hostile uploads', () => {
  it.each(REFUSED.map((h) => [h.name, h] as const))('%s → refused, nothing written', async (_name, hostile) => {
    tally.tried += 1;
    as(people().own.engineer);
    const before = await rowCounts(db());
    const res = await upload(await hostile.make());
    expect(hostile.status, JSON.stringify(res.body)).toContain(res.status);
    expect(res.body.error).toMatchObject({ code: expect.any(String), message: expect.any(String) });
    expect(await rowCounts(db())).toEqual(before);
    tally.held += 1;
  });

  it('a path-traversal file name is ignored: stored under the photo id, served as a fresh JPEG without metadata', async () => {
    tally.tried += 1;
    as(people().own.engineer);
    const withExif = await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 1, g: 2, b: 3 } } })
      .png()
      .withExif({ IFD0: { Make: 'LeakyCam', Artist: 'Home owner' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1' } })
      .toBuffer();
    const res = await upload({ bytes: withExif, filename: '../../../../tmp/evil.html', type: 'text/html' });
    expect(res.status).toBe(201);
    const row = await db()('photos').where({ id: res.id }).first('storage_key', 'mime');
    expect(row.storage_key).toBe(`${ids.org}/${ids.priyaVisit}/${res.id}.jpg`);
    expect(row.mime).toBe('image/jpeg');

    const served = await callRoute({ pattern: 'photos/[id]', method: 'GET', params: { id: res.id } });
    expect(served.status).toBe(200);
    expect(served.headers.get('content-type')).toBe('image/jpeg');
    expect(served.headers.get('x-content-type-options')).toBe('nosniff');
    expect(served.headers.get('content-disposition')).toBe(`inline; filename="${res.id}.jpg"`);
    const mod = await loadRoute('photos/[id]');
    const bytes = Buffer.from(await (await mod.GET!(new Request(`http://localhost:3000/api/v1/photos/${res.id}`), { params: Promise.resolve({ id: res.id }) })).arrayBuffer());
    const meta = await sharp(bytes).metadata();
    expect(meta.format).toBe('jpeg');
    expect(meta.exif).toBeUndefined();
    expect(bytes.includes(Buffer.from('LeakyCam'))).toBe(false);

    // Only the visit's engineer and the organisation's office; others as if it did not exist.
    const p = people();
    const who = [
      [p.own.engineer, 200],
      [p.own.office, 200],
      [p.otherEngineer, 404],
      [p.otherOrg.office, 404],
      [p.otherOrg.engineer, 404],
      [p.own.landlord, 403],
      [p.own.homeowner, 403],
      [null, 401],
    ] as const;
    for (const [person, status] of who) {
      as(person);
      const r = await callRoute({ pattern: 'photos/[id]', method: 'GET', params: { id: res.id } });
      expect(r.status, `${person?.email ?? 'anonymous'}`).toBe(status);
      if (status !== 200) expect(r.text).not.toContain('LeakyCam');
    }
    tally.held += 1;
  });
});
