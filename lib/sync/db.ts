// The field app's on-device database (IndexedDB through idb): the downloaded visits, what has been
// recorded for each visit, the outbox of changes waiting for the server, reading drafts and
// preferences. Browser-only; tests run it on fake-indexeddb.
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { FieldBundle, VisitRecord } from '../field/types';
import type { Mutation, MutationResult } from '../validations/sync';
import type { PhotoMeta } from '../validations/inspection';

export type OutboxStatus = 'pending' | 'sending' | 'sent' | 'failed' | 'rejected';

type EntryBase = {
  /** Queue position, given by IndexedDB: the order changes were made in, which is the order they are sent in. */
  seq?: number;
  /** The idempotency id the server deduplicates on: the mutation's or the photo's own id. */
  id: string;
  visitId: string;
  status: OutboxStatus;
  attempts: number;
  lastError: string | null;
  /** Rejections carry the server's field errors so the screen can say what was wrong. */
  rejection: Extract<MutationResult, { status: 'rejected' }> | null;
  createdAt: string;
  sentAt: string | null;
  /** Earliest time to try again after a failure (backing off); null means now. */
  nextAttemptAt: string | null;
  /** Short words for the list on screen, e.g. "Reading, high fire". */
  label: string;
};

export type MutationEntry = EntryBase & { type: 'mutation'; mutation: Mutation };
export type PhotoEntry = EntryBase & {
  type: 'photo';
  meta: Omit<PhotoMeta, 'caption' | 'takenAt'> & { caption: string | null; takenAt: string | null };
  /** The compressed image; dropped once the server has it, to free space on the phone. */
  bytes: ArrayBuffer | null;
  mime: string;
};
export type OutboxEntry = MutationEntry | PhotoEntry;

export type ReadingDraft = { key: string; values: Record<string, unknown>; savedAt: string };

export interface FieldDbSchema extends DBSchema {
  outbox: { key: number; value: OutboxEntry; indexes: { 'by-status': OutboxStatus; 'by-visit': string; 'by-id': string } };
  records: { key: string; value: VisitRecord };
  bundle: { key: string; value: FieldBundle };
  drafts: { key: string; value: ReadingDraft };
  prefs: { key: string; value: { key: string; value: string } };
}

export type FieldDb = IDBPDatabase<FieldDbSchema>;

export const FIELD_DB_NAME = 'hearthmark-field';
const VERSION = 1;

export function openFieldDb(name = FIELD_DB_NAME): Promise<FieldDb> {
  return openDB<FieldDbSchema>(name, VERSION, {
    upgrade(db) {
      const outbox = db.createObjectStore('outbox', { keyPath: 'seq', autoIncrement: true });
      outbox.createIndex('by-status', 'status');
      outbox.createIndex('by-visit', 'visitId');
      outbox.createIndex('by-id', 'id', { unique: true });
      db.createObjectStore('records', { keyPath: 'visitId' });
      db.createObjectStore('bundle');
      db.createObjectStore('drafts', { keyPath: 'key' });
      db.createObjectStore('prefs', { keyPath: 'key' });
    },
  });
}
