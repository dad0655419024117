// Reading and tending the outbox queue: what is waiting, what was interrupted, what to retry.
import type { FieldDb, OutboxEntry } from './db';

/** Every entry, oldest first. */
export async function listEntries(db: FieldDb): Promise<OutboxEntry[]> {
  return db.getAll('outbox');
}

export type OutboxCounts = { pending: number; sending: number; sent: number; failed: number; rejected: number };

export function countEntries(entries: readonly OutboxEntry[]): OutboxCounts {
  const counts: OutboxCounts = { pending: 0, sending: 0, sent: 0, failed: 0, rejected: 0 };
  for (const e of entries) counts[e.status] += 1;
  return counts;
}

/**
 * After a reload or a crash, entries caught mid-send are queued again. The server may already have
 * applied some of them; resending is safe because it answers those "duplicate".
 */
export async function resetInterrupted(db: FieldDb): Promise<number> {
  const tx = db.transaction('outbox', 'readwrite');
  const sending = await tx.store.index('by-status').getAll('sending');
  for (const e of sending) await tx.store.put({ ...e, status: 'pending' });
  await tx.done;
  return sending.length;
}

/** Puts failed and rejected entries (or the ones named) back in the queue to be sent now. */
export async function retryEntries(db: FieldDb, seqs?: readonly number[]): Promise<number> {
  const tx = db.transaction('outbox', 'readwrite');
  const all = await tx.store.getAll();
  let n = 0;
  for (const e of all) {
    if ((e.status === 'failed' || e.status === 'rejected') && (!seqs || (e.seq !== undefined && seqs.includes(e.seq)))) {
      await tx.store.put({ ...e, status: 'pending', nextAttemptAt: null, rejection: null });
      n += 1;
    }
  }
  await tx.done;
  return n;
}

/** Forgets sent entries older than the cut-off; unsent ones are never removed. */
export async function pruneSent(db: FieldDb, olderThan: Date): Promise<number> {
  const tx = db.transaction('outbox', 'readwrite');
  const sent = await tx.store.index('by-status').getAll('sent');
  let n = 0;
  for (const e of sent) {
    if (e.sentAt !== null && e.sentAt < olderThan.toISOString() && e.seq !== undefined) {
      await tx.store.delete(e.seq);
      n += 1;
    }
  }
  await tx.done;
  return n;
}
