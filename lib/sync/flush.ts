// Sends the outbox to the server, oldest first. Mutations go in batches to POST /api/v1/sync,
// photos one at a time to POST /api/v1/photos. An entry counts as sent only when the server says
// it committed it (applied or duplicate); anything unanswered is sent again later with the same id.
// Order is kept: after a network failure nothing behind the failed entry is sent until it goes.
import { MAX_BATCH_MUTATIONS, type MutationResult, type SyncResponse } from '../validations/sync';
import type { FieldDb, MutationEntry, OutboxEntry, PhotoEntry } from './db';

export type FlushOptions = {
  fetch: typeof fetch;
  now?: () => Date;
  /** Fewer than the server's limit, so a batch also stays well under its 1 MB body limit. */
  maxBatch?: number;
  maxBatchChars?: number;
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

/** The entries waiting to go, in order, up to (not past) a failed entry still backing off. */
async function due(db: FieldDb, now: Date): Promise<{ queue: OutboxEntry[]; waiting: boolean }> {
  const all = await db.getAll('outbox');
  const queue: OutboxEntry[] = [];
  for (const e of all) {
    if (e.status !== 'pending' && e.status !== 'failed') continue;
    if (e.status === 'failed' && e.nextAttemptAt !== null && e.nextAttemptAt > now.toISOString()) return { queue, waiting: true };
    queue.push(e);
  }
  return { queue, waiting: false };
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

async function sendPhoto(db: FieldDb, entry: PhotoEntry, opts: Required<Pick<FlushOptions, 'fetch' | 'now' | 'baseUrl'>>): Promise<{ sent: number; rejected: number; stop: FlushOutcome['stoppedBy'] | null }> {
  if (!entry.bytes) {
    await putAll(db, [{ ...entry, status: 'rejected', lastError: 'The photo is no longer on this device', rejection: { id: entry.id, status: 'rejected', httpStatus: 410, code: 'gone', message: 'The photo is no longer on this device' } }]);
    return { sent: 0, rejected: 1, stop: null };
  }
  await putAll(db, [{ ...entry, status: 'sending' }]);
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

/** Sends everything due, in order. Safe to call at any time; call it under flushExclusive in the app. */
export async function flushOutbox(db: FieldDb, options: FlushOptions): Promise<FlushOutcome> {
  const opts = { fetch: options.fetch, now: options.now ?? (() => new Date()), baseUrl: options.baseUrl ?? '' };
  const maxBatch = Math.min(options.maxBatch ?? 25, MAX_BATCH_MUTATIONS);
  const maxChars = options.maxBatchChars ?? 600_000;
  let sent = 0;
  let rejected = 0;
  for (;;) {
    const { queue, waiting } = await due(db, opts.now());
    if (queue.length === 0) return { sent, rejected, stoppedBy: waiting ? 'waiting' : 'done' };
    const head = queue[0]!;
    let step;
    if (head.type === 'photo') {
      step = await sendPhoto(db, head, opts);
    } else {
      const batch: MutationEntry[] = [];
      let chars = 0;
      for (const e of queue) {
        if (e.type !== 'mutation' || batch.length >= maxBatch) break;
        const size = JSON.stringify(e.mutation).length;
        if (batch.length > 0 && chars + size > maxChars) break;
        batch.push(e);
        chars += size;
      }
      step = await sendBatch(db, batch, opts);
    }
    sent += step.sent;
    rejected += step.rejected;
    if (step.stop) return { sent, rejected, stoppedBy: step.stop };
  }
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
