// The field outbox on fake-indexeddb: changes are kept in the order made, carry their own ids,
// are retried after a failure with the same ids, survive a reload, and are never lost or doubled.
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { randomUUID } from 'node:crypto';
import { beforeEach, describe, expect, it } from 'vitest';
import { openFieldDb, type FieldDb } from '@/lib/sync/db';
import { commitMutation, commitPhoto, getRecord } from '@/lib/sync/store';
import { countEntries, listEntries, resetInterrupted, retryEntries } from '@/lib/sync/outbox';
import { backoffMs, flushOutbox } from '@/lib/sync/flush';
import type { Mutation } from '@/lib/validations/sync';
import type { ApplianceDetails } from '@/lib/validations/inspection';

const VISIT = randomUUID();
const APPLIANCE = randomUUID();
const details: ApplianceDetails = {
  category: 'boiler',
  fuel: 'natural-gas',
  flueType: 'open_flue',
  location: 'Kitchen',
  make: null,
  model: null,
  serial: null,
  ratedInputKw: null,
  mfrRatioMax: null,
  mfrCoAirFreeMaxPpm: null,
  mfrCoMaxPpm: null,
};
const lookup = (id: string) => (id === APPLIANCE ? { details, updatedAt: null } : null);

function readingMutation(coPpm: number, testPoint: 'high_fire' | 'low_fire' | 'as_left' = 'high_fire'): Mutation {
  return {
    id: randomUUID(),
    visitId: VISIT,
    at: new Date().toISOString(),
    kind: 'reading.record',
    payload: {
      readingId: randomUUID(),
      applianceId: APPLIANCE,
      testPoint,
      values: { coPpm, co2Pct: 9, o2Pct: 4.9, flueTemp: 150, airTemp: 18, tempUnit: 'C' },
      analyserId: null,
      takenAt: new Date().toISOString(),
      replacesId: null,
    },
  };
}

/** A stand-in for the server: applies each mutation id once, answers duplicates, can refuse chosen ids. */
function fakeServer(options: { reject?: Set<string> } = {}) {
  const applied: string[] = [];
  const requests: Array<{ url: string; ids: string[] }> = [];
  let mode: 'ok' | 'offline' | 'drop-after-apply' | 'signed-out' | 'hang' = 'ok';
  const fetch: typeof globalThis.fetch = (async (url: string | URL | Request, init?: RequestInit) => {
    if (mode === 'offline') throw new TypeError('Failed to fetch');
    if (mode === 'hang') return new Promise<Response>(() => undefined);
    if (mode === 'signed-out') return new Response(JSON.stringify({ error: { code: 'unauthorized', message: 'Sign in' } }), { status: 401 });
    const u = String(url);
    if (u.endsWith('/api/v1/photos')) {
      const form = init?.body as FormData;
      const id = String(form.get('id'));
      requests.push({ url: u, ids: [id] });
      const duplicate = applied.includes(id);
      if (!duplicate) applied.push(id);
      return new Response(JSON.stringify({ photo: { id }, duplicate }), { status: duplicate ? 200 : 201 });
    }
    const body = JSON.parse(String(init?.body)) as { mutations: Mutation[] };
    requests.push({ url: u, ids: body.mutations.map((m) => m.id) });
    const results = body.mutations.map((m) => {
      if (options.reject?.has(m.id)) return { id: m.id, status: 'rejected', httpStatus: 422, code: 'invalid_input', message: 'Some fields are not valid.', fields: { 'values.o2Pct': 'O2 must be from 0 to below 20.9 %' } };
      if (applied.includes(m.id)) return { id: m.id, status: 'duplicate' };
      applied.push(m.id);
      return { id: m.id, status: 'applied' };
    });
    // The server committed, but the answer never reached the phone.
    if (mode === 'drop-after-apply') throw new TypeError('Connection reset');
    return new Response(JSON.stringify({ results }), { status: 200, headers: { 'content-type': 'application/json' } });
  }) as typeof globalThis.fetch;
  return { fetch, applied, requests, setMode: (m: typeof mode) => (mode = m) };
}

let db: FieldDb;
const NAME = 'hearthmark-field-test';

beforeEach(async () => {
  // A fresh IndexedDB for each test.
  (globalThis as { indexedDB?: IDBFactory }).indexedDB = new IDBFactory();
  db = await openFieldDb(NAME);
});

describe('saving on the device', () => {
  it('writes the record and queues the change in one go, in the order made, each with its own id', async () => {
    const ms = [readingMutation(10), readingMutation(20, 'low_fire'), readingMutation(30, 'as_left')];
    for (const m of ms) await commitMutation(db, { mutation: m, label: 'Reading', lookup });
    const entries = await listEntries(db);
    expect(entries.map((e) => e.id)).toEqual(ms.map((m) => m.id));
    expect(entries.map((e) => e.seq)).toEqual([...entries.map((e) => e.seq!)].sort((a, b) => a - b));
    expect(new Set(entries.map((e) => e.id)).size).toBe(3);
    expect(entries.every((e) => /^[0-9a-f-]{36}$/.test(e.id) && e.status === 'pending')).toBe(true);
    const record = await getRecord(db, VISIT);
    expect(record.inspections[APPLIANCE]!.readings.map((r) => r.coPpm)).toEqual([10, 20, 30]);
  });
});

describe('sending', () => {
  it('sends in the order made and marks each change sent only after the server answers', async () => {
    const server = fakeServer();
    const ms = [readingMutation(10), readingMutation(20, 'low_fire')];
    for (const m of ms) await commitMutation(db, { mutation: m, label: 'Reading', lookup });
    const photoId = randomUUID();
    await commitPhoto(db, { visitId: VISIT, ref: { id: photoId, purpose: 'appliance', applianceId: APPLIANCE, findingId: null, caption: null, takenAt: null, thumbnail: null }, bytes: new Uint8Array([0xff, 0xd8, 0xff]).buffer, mime: 'image/jpeg', label: 'Photo' });
    const last = readingMutation(30, 'as_left');
    await commitMutation(db, { mutation: last, label: 'Reading', lookup });

    const outcome = await flushOutbox(db, { fetch: server.fetch });
    expect(outcome).toEqual({ sent: 4, rejected: 0, stoppedBy: 'done' });
    // Two batches around the photo: the photo goes after the changes made before it.
    expect(server.requests.map((r) => r.ids)).toEqual([[ms[0]!.id, ms[1]!.id], [photoId], [last.id]]);
    const entries = await listEntries(db);
    expect(countEntries(entries)).toMatchObject({ sent: 4, pending: 0 });
    const photo = entries.find((e) => e.id === photoId)!;
    expect(photo.type === 'photo' && photo.bytes).toBeNull();
  });

  it('after a network failure it backs off, then retries with the same ids', async () => {
    const server = fakeServer();
    const m = readingMutation(15);
    await commitMutation(db, { mutation: m, label: 'Reading', lookup });
    const t0 = new Date('2026-03-01T10:00:00Z');
    server.setMode('offline');
    expect((await flushOutbox(db, { fetch: server.fetch, now: () => t0 })).stoppedBy).toBe('network');
    const [entry] = await listEntries(db);
    expect(entry).toMatchObject({ status: 'failed', attempts: 1, nextAttemptAt: new Date(t0.getTime() + backoffMs(1)).toISOString() });
    expect(entry!.lastError).toContain('No connection');

    server.setMode('ok');
    // Still backing off: nothing is sent, and nothing behind it jumps the queue.
    const later = readingMutation(16, 'low_fire');
    await commitMutation(db, { mutation: later, label: 'Reading', lookup });
    expect(await flushOutbox(db, { fetch: server.fetch, now: () => new Date(t0.getTime() + 500) })).toEqual({ sent: 0, rejected: 0, stoppedBy: 'waiting' });
    expect(server.requests).toHaveLength(0);

    const outcome = await flushOutbox(db, { fetch: server.fetch, now: () => new Date(t0.getTime() + backoffMs(1) + 1) });
    expect(outcome).toEqual({ sent: 2, rejected: 0, stoppedBy: 'done' });
    expect(server.requests[0]!.ids).toEqual([m.id, later.id]);
  });

  it('a connection dropped after the server committed: the resend is answered duplicate, nothing is applied twice', async () => {
    const server = fakeServer();
    const ms = [readingMutation(11), readingMutation(12, 'low_fire'), readingMutation(13, 'as_left')];
    for (const m of ms) await commitMutation(db, { mutation: m, label: 'Reading', lookup });
    server.setMode('drop-after-apply');
    const t0 = new Date();
    await flushOutbox(db, { fetch: server.fetch, now: () => t0 });
    expect(countEntries(await listEntries(db)).failed).toBe(3);
    server.setMode('ok');
    await flushOutbox(db, { fetch: server.fetch, now: () => new Date(t0.getTime() + 120_000) });
    expect(countEntries(await listEntries(db)).sent).toBe(3);
    expect(server.applied).toEqual(ms.map((m) => m.id));
    expect(server.requests.map((r) => r.ids)).toEqual([ms.map((m) => m.id), ms.map((m) => m.id)]);
  });

  it('a rejected change is marked with the reason and does not hold back the rest; retry queues it again', async () => {
    const bad = readingMutation(99);
    const server = fakeServer({ reject: new Set([bad.id]) });
    const good = readingMutation(12, 'low_fire');
    await commitMutation(db, { mutation: bad, label: 'Reading', lookup });
    await commitMutation(db, { mutation: good, label: 'Reading', lookup });
    expect(await flushOutbox(db, { fetch: server.fetch })).toEqual({ sent: 1, rejected: 1, stoppedBy: 'done' });
    const entries = await listEntries(db);
    const rejected = entries.find((e) => e.id === bad.id)!;
    expect(rejected.status).toBe('rejected');
    expect(rejected.rejection?.fields).toEqual({ 'values.o2Pct': 'O2 must be from 0 to below 20.9 %' });
    expect(entries.find((e) => e.id === good.id)!.status).toBe('sent');
    expect(await retryEntries(db)).toBe(1);
    expect((await listEntries(db)).find((e) => e.id === bad.id)!.status).toBe('pending');
  });

  it('a signed-out session leaves the changes queued and unchanged', async () => {
    const server = fakeServer();
    await commitMutation(db, { mutation: readingMutation(5), label: 'Reading', lookup });
    server.setMode('signed-out');
    expect((await flushOutbox(db, { fetch: server.fetch })).stoppedBy).toBe('signed_out');
    const [entry] = await listEntries(db);
    expect(entry).toMatchObject({ status: 'pending', attempts: 0 });
  });
});

describe('photos beside the changes', () => {
  // Bounded parallel uploads after the changes they depend on: common practice, no source.
  it('go no more than the limit at a time (three here), each after the changes made before it; later changes do not wait for an upload', async () => {
    const log: string[] = [];
    let inFlight = 0;
    let most = 0;
    const waiting: Array<() => void> = [];
    const fetch = (async (url: string | URL | Request, init?: RequestInit) => {
      if (String(url).endsWith('/api/v1/photos')) {
        const id = String((init?.body as FormData).get('id'));
        log.push(`photo ${id}`);
        inFlight += 1;
        most = Math.max(most, inFlight);
        await new Promise<void>((resolve) => waiting.push(resolve));
        inFlight -= 1;
        return new Response(JSON.stringify({ photo: { id }, duplicate: false }), { status: 201 });
      }
      const body = JSON.parse(String(init?.body)) as { mutations: Mutation[] };
      log.push(`batch ${body.mutations.map((m) => m.id).join(',')}`);
      return new Response(JSON.stringify({ results: body.mutations.map((m) => ({ id: m.id, status: 'applied' })) }), { status: 200 });
    }) as typeof globalThis.fetch;
    const before = readingMutation(10);
    await commitMutation(db, { mutation: before, label: 'Reading', lookup });
    const photoIds = [randomUUID(), randomUUID(), randomUUID(), randomUUID()];
    for (const id of photoIds) {
      await commitPhoto(db, { visitId: VISIT, ref: { id, purpose: 'appliance', applianceId: APPLIANCE, findingId: null, caption: null, takenAt: null, thumbnail: null }, bytes: new Uint8Array([0xff, 0xd8, 0xff]).buffer, mime: 'image/jpeg', label: 'Photo' });
    }
    const after = readingMutation(20, 'low_fire');
    await commitMutation(db, { mutation: after, label: 'Reading', lookup });

    const flushing = flushOutbox(db, { fetch, maxParallelPhotos: 3 });
    for (let i = 0; i < 200 && !log.includes(`batch ${after.id}`); i++) await new Promise((r) => setTimeout(r, 5));
    // The change made before the photos went first; three photos are on their way, the fourth waits,
    // and the change made after them has gone without waiting.
    expect(log).toEqual([`batch ${before.id}`, ...photoIds.slice(0, 3).map((id) => `photo ${id}`), `batch ${after.id}`]);
    while (log.length < 6 || waiting.length) {
      waiting.splice(0).forEach((resolve) => resolve());
      await new Promise((r) => setTimeout(r, 5));
    }
    expect(await flushing).toEqual({ sent: 6, rejected: 0, stoppedBy: 'done' });
    expect(most).toBe(3);
    expect(log[5]).toBe(`photo ${photoIds[3]}`);
    expect(countEntries(await listEntries(db))).toMatchObject({ sent: 6, pending: 0, sending: 0 });
  });
});

describe('surviving a reload', () => {
  it('changes caught mid-send are still there after the app is closed and reopened, and go once', async () => {
    const server = fakeServer();
    const ms = [readingMutation(21), readingMutation(22, 'low_fire')];
    for (const m of ms) await commitMutation(db, { mutation: m, label: 'Reading', lookup });
    server.setMode('hang');
    // The request is in flight when the app is closed.
    void flushOutbox(db, { fetch: server.fetch });
    await new Promise((r) => setTimeout(r, 20));
    expect(countEntries(await listEntries(db)).sending).toBe(2);
    db.close();

    const reopened = await openFieldDb(NAME);
    expect((await listEntries(reopened)).map((e) => e.id)).toEqual(ms.map((m) => m.id));
    expect((await getRecord(reopened, VISIT)).inspections[APPLIANCE]!.readings).toHaveLength(2);
    expect(await resetInterrupted(reopened)).toBe(2);
    server.setMode('ok');
    expect(await flushOutbox(reopened, { fetch: server.fetch })).toEqual({ sent: 2, rejected: 0, stoppedBy: 'done' });
    expect(server.applied).toEqual(ms.map((m) => m.id));
    reopened.close();
  });
});
