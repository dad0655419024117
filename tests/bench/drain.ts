// Offline drain: queues N visits' worth of changes (arrival, two readings, a room check and one
// ~200 kB photo each) in the real lib/sync outbox on fake-indexeddb in Node, as if recorded with
// no signal, then "reconnects" and drains it against the running server with lib/sync's flush,
// and counts rows server-side: every change exactly once, nothing lost or duplicated.
import 'fake-indexeddb/auto';
import { randomBytes, randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import sharp from 'sharp';
import { openFieldDb } from '@/lib/sync/db';
import { commitMutation, commitPhoto } from '@/lib/sync/store';
import { flushOutbox } from '@/lib/sync/flush';
import { countEntries, listEntries } from '@/lib/sync/outbox';
import type { ApplianceLookup } from '@/lib/field/record';
import type { Mutation } from '@/lib/validations/sync';
import type { ApplianceDetails } from '@/lib/validations/inspection';
import { readingMutation, type BenchVisit } from './fixtures';
import { record } from './report';

/** A photo-sized JPEG: noise does not compress, so ~200 kB on the wire like a phone's compressed photo. */
async function photoJpeg(): Promise<ArrayBuffer> {
  const width = 560;
  const height = 420;
  const buf = await sharp(randomBytes(width * height * 3), { raw: { width, height, channels: 3 } }).jpeg({ quality: 92 }).toBuffer();
  return buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength) as ArrayBuffer;
}

export async function benchOfflineDrain(input: { baseUrl: string; cookie: string; visits: BenchVisit[]; knex: Knex; smoke: boolean }): Promise<void> {
  const db = await openFieldDb(`bench-drain-${Date.now()}`);
  const photo = await photoJpeg();
  const details: ApplianceDetails = { category: 'boiler', fuel: 'natural-gas', flueType: 'room_sealed', location: 'Room 1', make: 'Bench', model: 'B-1', serial: null, ratedInputKw: null, mfrRatioMax: null, mfrCoAirFreeMaxPpm: null, mfrCoMaxPpm: null };
  const lookup: ApplianceLookup = () => ({ details, updatedAt: null });
  let mutations = 0;
  for (const visit of input.visits) {
    const now = new Date().toISOString();
    const queued: Mutation[] = [
      { id: randomUUID(), visitId: visit.visitId, kind: 'visit.arrive', at: now, payload: { arrivedAt: now } } as Mutation,
      readingMutation(visit, 0) as unknown as Mutation,
      readingMutation(visit, 1) as unknown as Mutation,
      { id: randomUUID(), visitId: visit.visitId, kind: 'roomCheck.save', at: now, payload: { roomCheckId: randomUUID(), room: 'Kitchen', coPpm: 2, minutes: 15, takenAt: now } } as Mutation,
    ];
    for (const mutation of queued) await commitMutation(db, { mutation, label: mutation.kind, lookup });
    mutations += queued.length;
    await commitPhoto(db, {
      visitId: visit.visitId,
      ref: { id: randomUUID(), purpose: 'appliance', applianceId: visit.applianceIds[0]!, findingId: null, caption: 'Data plate', takenAt: now, thumbnail: null },
      bytes: photo,
      mime: 'image/jpeg',
      label: 'Photo',
    });
  }
  const queuedCounts = countEntries(await listEntries(db));

  // Reconnected: the session cookie rides on every request, as the browser would send it.
  const fetchWithSession: typeof fetch = (url, init) => fetch(url, { ...init, headers: { ...(init?.headers as Record<string, string>), cookie: input.cookie, origin: input.baseUrl } });
  const t0 = performance.now();
  let rounds = 0;
  for (;;) {
    rounds++;
    const outcome = await flushOutbox(db, { fetch: fetchWithSession, baseUrl: input.baseUrl });
    if (outcome.stoppedBy === 'done') break;
    if (outcome.stoppedBy === 'signed_out') throw new Error('drain: the session was refused');
    if (performance.now() - t0 > 600_000) throw new Error('drain: still not empty after 10 minutes');
    await new Promise((r) => setTimeout(r, 250)); // a failed entry backs off; the next flush picks it up
  }
  const seconds = (performance.now() - t0) / 1000;
  const left = countEntries(await listEntries(db));
  db.close();

  // Server-side: exactly the queued changes, once each.
  const visitIds = input.visits.map((v) => v.visitId);
  const count = async (table: string) => Number(((await input.knex(table).whereIn('visit_id', visitIds).count({ n: '*' })) as Array<{ n: number }>)[0]!.n);
  const readings = Number(((await input.knex('readings as r').join('inspections as i', 'i.id', 'r.inspection_id').whereIn('i.visit_id', visitIds).count({ n: '*' })) as Array<{ n: number }>)[0]!.n);
  const applied = await count('sync_mutations');
  const photos = await count('photos');
  const roomChecks = await count('room_checks');
  const n = input.visits.length;
  const exact = applied === mutations && photos === n && readings === 2 * n && roomChecks === n && left.pending === 0 && left.failed === 0 && left.rejected === 0;
  const megabytes = (photo.byteLength * n) / 2 ** 20;
  record({
    name: `drain.${n}_visits_with_photos`,
    value: seconds,
    unit: 's',
    target: input.smoke ? 'smoke (exactly once)' : '≤ 90 s, exactly once',
    pass: input.smoke ? exact : seconds <= 90 && exact,
    note: `lib/sync outbox on fake-indexeddb in Node → running server; ${queuedCounts.pending} entries queued (${mutations} mutations + ${n} photos of ${(photo.byteLength / 1024).toFixed(0)} kB, ${megabytes.toFixed(0)} MB); server rows: ${applied} sync_mutations, ${readings} readings, ${roomChecks} room checks, ${photos} photos (expected ${mutations}/${2 * n}/${n}/${n}); outbox left ${JSON.stringify(left)}; ${rounds} flush rounds`,
  });
  if (!exact) throw new Error('drain: server rows do not match the queued changes exactly');
}
