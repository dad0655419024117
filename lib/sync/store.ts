// Saving on the device. Every change is written to the visit record and queued in the outbox in one
// IndexedDB transaction: either both happen or neither, so what the screen shows is always what
// will be sent, and nothing typed is lost if the phone dies a moment later.
import { applyMutation, addPhoto, type ApplianceLookup } from '../field/record';
import { emptyVisitRecord, type FieldBundle, type PhotoRef, type VisitRecord } from '../field/types';
import type { Mutation } from '../validations/sync';
import type { FieldDb, MutationEntry, OutboxEntry, PhotoEntry, ReadingDraft } from './db';

function entryBase(id: string, visitId: string, label: string, now: string) {
  return { id, visitId, status: 'pending' as const, attempts: 0, lastError: null, rejection: null, createdAt: now, sentAt: null, nextAttemptAt: null, label };
}

export async function getRecord(db: FieldDb, visitId: string): Promise<VisitRecord> {
  return (await db.get('records', visitId)) ?? emptyVisitRecord(visitId);
}

export async function listRecords(db: FieldDb): Promise<VisitRecord[]> {
  return db.getAll('records');
}

/** Applies the change to the visit record and queues it, atomically. Returns the new record. */
export async function commitMutation(db: FieldDb, input: { mutation: Mutation; label: string; lookup: ApplianceLookup; now?: string }): Promise<{ record: VisitRecord; entry: OutboxEntry }> {
  const tx = db.transaction(['records', 'outbox'], 'readwrite');
  const records = tx.objectStore('records');
  const current = (await records.get(input.mutation.visitId)) ?? emptyVisitRecord(input.mutation.visitId);
  const record = applyMutation(current, input.mutation, input.lookup);
  const entry: MutationEntry = { ...entryBase(input.mutation.id, input.mutation.visitId, input.label, input.now ?? new Date().toISOString()), type: 'mutation', mutation: input.mutation };
  await records.put(record);
  const seq = await tx.objectStore('outbox').add(entry);
  await tx.done;
  return { record, entry: { ...entry, seq } };
}

/** Adds a photo to the visit record and queues its upload, atomically. */
export async function commitPhoto(
  db: FieldDb,
  input: { visitId: string; ref: PhotoRef & { purpose: PhotoEntry['meta']['purpose'] }; bytes: ArrayBuffer; mime: string; label: string; now?: string },
): Promise<{ record: VisitRecord; entry: OutboxEntry }> {
  const tx = db.transaction(['records', 'outbox'], 'readwrite');
  const records = tx.objectStore('records');
  const current = (await records.get(input.visitId)) ?? emptyVisitRecord(input.visitId);
  const record = addPhoto(current, input.ref);
  const entry: PhotoEntry = {
    ...entryBase(input.ref.id, input.visitId, input.label, input.now ?? new Date().toISOString()),
    type: 'photo',
    meta: {
      id: input.ref.id,
      visitId: input.visitId,
      purpose: input.ref.purpose,
      applianceId: input.ref.applianceId,
      findingId: input.ref.findingId,
      caption: input.ref.caption,
      takenAt: input.ref.takenAt,
    },
    bytes: input.bytes,
    mime: input.mime,
  };
  await records.put(record);
  const seq = await tx.objectStore('outbox').add(entry);
  await tx.done;
  return { record, entry: { ...entry, seq } };
}

/**
 * Keeps the newly downloaded visits, plus any visit from the previous download that has a record on
 * this device (it may have dropped off the server's list once submitted, but its work is still here).
 */
export async function saveBundle(db: FieldDb, fresh: FieldBundle): Promise<FieldBundle> {
  const tx = db.transaction(['bundle', 'records'], 'readwrite');
  const previous = await tx.objectStore('bundle').get('current');
  const recorded = new Set(await tx.objectStore('records').getAllKeys());
  const freshIds = new Set(fresh.visits.map((v) => v.id));
  const kept = (previous?.visits ?? []).filter((v) => !freshIds.has(v.id) && recorded.has(v.id));
  const limitContexts = { ...fresh.limitContexts };
  for (const v of kept) {
    const ctx = previous?.limitContexts[v.site.jurisdictionId];
    if (ctx && !limitContexts[v.site.jurisdictionId]) limitContexts[v.site.jurisdictionId] = ctx;
  }
  const merged: FieldBundle = { ...fresh, visits: [...fresh.visits, ...kept], limitContexts };
  await tx.objectStore('bundle').put(merged, 'current');
  await tx.done;
  return merged;
}

export async function getBundle(db: FieldDb): Promise<FieldBundle | null> {
  return (await db.get('bundle', 'current')) ?? null;
}

export async function saveDraft(db: FieldDb, key: string, values: Record<string, unknown>): Promise<void> {
  const draft: ReadingDraft = { key, values, savedAt: new Date().toISOString() };
  await db.put('drafts', draft);
}

export async function getDraft(db: FieldDb, key: string): Promise<ReadingDraft | null> {
  return (await db.get('drafts', key)) ?? null;
}

export async function deleteDraft(db: FieldDb, key: string): Promise<void> {
  await db.delete('drafts', key);
}

export async function listDraftKeys(db: FieldDb): Promise<string[]> {
  return db.getAllKeys('drafts');
}

export async function getPref(db: FieldDb, key: string): Promise<string | null> {
  return (await db.get('prefs', key))?.value ?? null;
}

export async function setPref(db: FieldDb, key: string, value: string): Promise<void> {
  await db.put('prefs', { key, value });
}
