// Sends the outbox to the server, oldest first. Mutations go in batches to POST /api/v1/sync, in
// the order made; photos go to POST /api/v1/photos, a few at a time beside the batches. An entry
// counts as sent only when the server says it committed it (applied or duplicate); anything
// unanswered is sent again later with the same id.
// Order: a photo starts only once every change made before it is committed (so the appliance it
// names exists); changes made after a photo do not wait for its upload, since nothing the server
// checks depends on a photo. After a network failure nothing is started behind the failed entry
// until it goes.
import type { MutationResult, SyncResponse } from '../validations/sync';
import { MAX_BATCH_MUTATIONS } from '../validations/sync-limits';
import type { FieldDb, MutationEntry, OutboxEntry, PhotoEntry } from './db';

export type FlushOptions = {
  fetch: typeof fetch;
  now?: () => Date;
  /** Fewer than the server's limit, so a batch also stays well under its 1 MB body limit. */
  maxBatch?: number;
  maxBatchChars?: number;
  /** Photo uploads in flight at once (4 by default). */
  maxParallelPhotos?: number;
  baseUrl?: string;
};

export type FlushOutcome = {
  sent: number;
  rejected: number;
  /** Why sending stopped: all done, the network failed, the session ended, or a failed entry is waiting to retry. */
  stoppedBy: 'done' | 'network' | 'signed_out' | 'waiting';
};

const MAX_BACKOFF_MS = 60_000;

/** 2 s, 4 s, 8 s … up to a minute between tries of the same entry. */
export function backoffMs(attempts: number): number {
  return Math.min(MAX_BACKOFF_MS, 1000 * 2 ** Math.max(1, attempts));
}

async function putAll(db: FieldDb, entries: OutboxEntry[]): Promise<void> {
  const tx = db.transaction('outbox', 'readwrite');
  for (const e of entries) await tx.store.put(e);
  await tx.done;
}

type Step = { photos: PhotoEntry[]; batch: MutationEntry[]; waiting: boolean };

/**
 * What to send next, in order, up to (not past) a failed entry still backing off: the photos at the
 * head of the queue, then the changes after them up to the next photo. Reads the queue's keys and
 * only the entries this step needs: the photos' bytes are not copied out for every step.
 */
async function nextStep(db: FieldDb, now: Date, limits: { maxBatch: number; maxChars: number; maxPhotos: number }): Promise<Step> {
  const [pending, failedKeys] = await Promise.all([db.getAllKeysFromIndex('outbox', 'by-status', 'pending'), db.getAllKeysFromIndex('outbox', 'by-status', 'failed')]);
  const keys = [...pending, ...failedKeys].sort((a, b) => a - b);
  const step: Step = { photos: [], batch: [], waiting: false };
  let chars = 0;
  for (const key of keys) {
    const e = await db.get('outbox', key);
    if (!e || (e.status !== 'pending' && e.status !== 'failed')) continue; // changed meanwhile
    if (e.status === 'failed' && e.nextAttemptAt !== null && e.nextAttemptAt > now.toISOString()) return { ...step, waiting: true };
    if (e.type === 'photo') {
      if (step.batch.length > 0 || step.photos.length >= limits.maxPhotos) break;
      step.photos.push(e);
      continue;
    }
    if (step.batch.length >= limits.maxBatch) break;
    const size = JSON.stringify(e.mutation).length;
    if (step.batch.length > 0 && chars + size > limits.maxChars) break;
    step.batch.push(e);
    chars += size;
  }
  return step;
}

function failed(e: OutboxEntry, message: string, now: Date): OutboxEntry {
  const attempts = e.attempts + 1;
  return { ...e, status: 'failed', attempts, lastError: message, nextAttemptAt: new Date(now.getTime() + backoffMs(attempts)).toISOString() };
}

type Rejection = Extract<MutationResult, { status: 'rejected' }>;

function isRejection(r: MutationResult): r is Rejection {
  return r.status === 'rejected';
}

async function errorMessage(res: Response): Promise<{ code: string; message: string; fields?: Record<string, string> }> {
  const body = (await res.json().catch(() => null)) as { error?: { code?: string; message?: string; fields?: Record<string, string> } } | null;
  return { code: body?.error?.code ?? 'http_error', message: body?.error?.message ?? `The server answered ${res.status}`, fields: body?.error?.fields };
}

async function sendBatch(db: FieldDb, batch: MutationEntry[], opts: Required<Pick<FlushOptions, 'fetch' | 'now' | 'baseUrl'>>): Promise<{ sent: number; rejected: number; stop: FlushOutcome['stoppedBy'] | null }> {
  await putAll(db, batch.map((e) => ({ ...e, status: 'sending' })));
  let res: Response;
  try {
    res = await opts.fetch(`${opts.baseUrl}/api/v1/sync`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      credentials: 'same-origin',
      body: JSON.stringify({ mutations: batch.map((e) => e.mutation) }),
    });
  } catch (err) {
    const now = opts.now();
    await putAll(db, batch.map((e) => failed(e, err instanceof Error ? `No connection: ${err.message}` : 'No connection', now)));
    return { sent: 0, rejected: 0, stop: 'network' };
  }
  if (res.status === 401 || res.status === 403) {
    // Not the entries' fault: they wait, unchanged, until the engineer signs in again.
    await putAll(db, batch);
    return { sent: 0, rejected: 0, stop: 'signed_out' };
  }
  if (!res.ok) {
    const now = opts.now();
    const err = await errorMessage(res);
    if (res.status >= 500 || res.status === 429) {
      await putAll(db, batch.map((e) => failed(e, err.message, now)));
      return { sent: 0, rejected: 0, stop: 'network' };
    }
    // The batch as a whole was refused; each entry is marked so the engineer can see and retry it.
    await putAll(db, batch.map((e) => ({ ...e, status: 'rejected', attempts: e.attempts + 1, lastError: err.message, rejection: { id: e.id, status: 'rejected', httpStatus: res.status, code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } })));
    return { sent: 0, rejected: batch.length, stop: null };
  }
  const body = (await res.json().catch(() => null)) as SyncResponse | null;
  const byId = new Map<string, MutationResult>((body?.results ?? []).map((r) => [r.id, r]));
  const now = opts.now();
  let sent = 0;
  let rejected = 0;
  let stop: FlushOutcome['stoppedBy'] | null = null;
  const updated = batch.map((e): OutboxEntry => {
    const r = byId.get(e.mutation.id);
    if (!r) {
      stop = 'network';
      return failed(e, 'The server did not answer for this change', now);
    }
    if (!isRejection(r)) {
      sent += 1;
      return { ...e, status: 'sent', sentAt: now.toISOString(), lastError: r.conflict ? 'Saved; someone else changed the same thing meanwhile, both versions are kept' : null, attempts: e.attempts + 1 };
    }
    if (r.httpStatus >= 500) {
      stop = 'network';
      return failed(e, r.message, now);
    }
    rejected += 1;
    return { ...e, status: 'rejected', attempts: e.attempts + 1, lastError: r.message, rejection: r };
  });
  await putAll(db, updated);
  return { sent, rejected, stop };
}

/** Uploads a photo already marked as sending. */
async function sendPhoto(db: FieldDb, entry: PhotoEntry, opts: Required<Pick<FlushOptions, 'fetch' | 'now' | 'baseUrl'>>): Promise<{ sent: number; rejected: number; stop: FlushOutcome['stoppedBy'] | null }> {
  if (!entry.bytes) {
    await putAll(db, [{ ...entry, status: 'rejected', lastError: 'The photo is no longer on this device', rejection: { id: entry.id, status: 'rejected', httpStatus: 410, code: 'gone', message: 'The photo is no longer on this device' } }]);
    return { sent: 0, rejected: 1, stop: null };
  }
  const form = new FormData();
  for (const [key, value] of Object.entries(entry.meta)) if (value !== null && value !== undefined) form.set(key, String(value));
  form.set('file', new Blob([entry.bytes], { type: entry.mime }), `${entry.id}.jpg`);
  let res: Response;
  try {
    res = await opts.fetch(`${opts.baseUrl}/api/v1/photos`, { method: 'POST', body: form, credentials: 'same-origin' });
  } catch (err) {
    await putAll(db, [failed(entry, err instanceof Error ? `No connection: ${err.message}` : 'No connection', opts.now())]);
    return { sent: 0, rejected: 0, stop: 'network' };
  }
  if (res.status === 401 || res.status === 403) {
    await putAll(db, [entry]);
    return { sent: 0, rejected: 0, stop: 'signed_out' };
  }
  if (res.ok) {
    // The server has it: the copy on the phone is no longer needed (the record keeps a thumbnail).
    await putAll(db, [{ ...entry, status: 'sent', sentAt: opts.now().toISOString(), bytes: null, lastError: null, attempts: entry.attempts + 1 }]);
    return { sent: 1, rejected: 0, stop: null };
  }
  const err = await errorMessage(res);
  if (res.status >= 500 || res.status === 429) {
    await putAll(db, [failed(entry, err.message, opts.now())]);
    return { sent: 0, rejected: 0, stop: 'network' };
  }
  await putAll(db, [{ ...entry, status: 'rejected', attempts: entry.attempts + 1, lastError: err.message, rejection: { id: entry.id, status: 'rejected', httpStatus: res.status, code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } }]);
  return { sent: 0, rejected: 1, stop: null };
}

/** Which reason to report when more than one thing stopped the flush. */
const STOP_RANK: Record<FlushOutcome['stoppedBy'], number> = { signed_out: 3, network: 2, waiting: 1, done: 0 };

/** Sends everything due, in order. Safe to call at any time; call it under flushExclusive in the app. */
export async function flushOutbox(db: FieldDb, options: FlushOptions): Promise<FlushOutcome> {
  const opts = { fetch: options.fetch, now: options.now ?? (() => new Date()), baseUrl: options.baseUrl ?? '' };
  const limits = {
    maxBatch: Math.min(options.maxBatch ?? 25, MAX_BATCH_MUTATIONS),
    maxChars: options.maxBatchChars ?? 600_000,
    maxPhotos: Math.max(1, options.maxParallelPhotos ?? 4),
  };
  let sent = 0;
  let rejected = 0;
  let stop: FlushOutcome['stoppedBy'] | null = null;
  const tally = (step: { sent: number; rejected: number; stop: FlushOutcome['stoppedBy'] | null }) => {
    sent += step.sent;
    rejected += step.rejected;
    if (step.stop && (stop === null || STOP_RANK[step.stop] > STOP_RANK[stop])) stop = step.stop;
  };
  const uploads = new Set<Promise<void>>();
  let failure: unknown = null;
  try {
    while (stop === null) {
      const step = await nextStep(db, opts.now(), limits);
      // Every change before these photos is committed: they may go, a few at once.
      const free = limits.maxPhotos - uploads.size;
      const starting = step.photos.slice(0, Math.max(0, free));
      if (starting.length) await putAll(db, starting.filter((p) => p.bytes).map((p) => ({ ...p, status: 'sending' })));
      for (const photo of starting) {
        const upload: Promise<void> = sendPhoto(db, photo, opts)
          .then(tally, (err: unknown) => {
            // The device's own storage failed mid-upload: stop starting more, and report it below.
            failure ??= err;
            tally({ sent: 0, rejected: 0, stop: 'network' });
          })
          .finally(() => uploads.delete(upload));
        uploads.add(upload);
      }
      if (step.batch.length > 0) {
        tally(await sendBatch(db, step.batch, opts));
        continue;
      }
      if (uploads.size === 0 && starting.length === 0) return { sent, rejected, stoppedBy: step.waiting ? 'waiting' : 'done' };
      // Nothing else may go until an upload finishes (a free slot, or the queue behind it).
      if (starting.length === 0 || step.photos.length > starting.length) await Promise.race(uploads);
    }
  } finally {
    await Promise.all(uploads);
  }
  if (failure) throw failure;
  return { sent, rejected, stoppedBy: stop ?? 'done' };
}

type LockManagerLike = { request: (name: string, options: { ifAvailable: boolean }, cb: (lock: unknown) => Promise<unknown>) => Promise<unknown> };

let localChain: Promise<unknown> = Promise.resolve();

/**
 * Runs one flush at a time across every open tab (Web Locks), or within this page where the
 * browser has no Web Locks. A tab that finds another flushing skips: that one sends for both.
 */
export async function flushExclusive(db: FieldDb, options: FlushOptions): Promise<FlushOutcome | null> {
  const locks = (globalThis.navigator as unknown as { locks?: LockManagerLike } | undefined)?.locks;
  if (locks) {
    let outcome: FlushOutcome | null = null;
    await locks.request('hearthmark-outbox', { ifAvailable: true }, async (lock) => {
      if (lock) outcome = await flushOutbox(db, options);
    });
    return outcome;
  }
  const run = localChain.then(() => flushOutbox(db, options));
  localChain = run.catch(() => undefined);
  return run;
}
