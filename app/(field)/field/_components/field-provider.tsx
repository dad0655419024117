'use client';
// The field app's state: the visits kept on this phone, what has been recorded, and the outbox.
// Everything is read from IndexedDB first, so the app works with no network; when online it fetches
// the visit list from /api/v1/field/visits and sends the outbox.
import { createContext, useCallback, useEffect, useMemo, useRef, useState, useSyncExternalStore } from 'react';
import useSWR from 'swr';
import { fetchJson } from '@/lib/fetch-json';
import { FIELD_DB_NAME, openFieldDb, type FieldDb, type OutboxEntry } from '@/lib/sync/db';
import { commitMutation, commitPhoto, getBundle, getPref, listRecords, saveBundle, setPref } from '@/lib/sync/store';
import { listEntries, pruneSent, resetInterrupted, retryEntries } from '@/lib/sync/outbox';
import { flushExclusive, type FlushOutcome } from '@/lib/sync/flush';
import type { Mutation } from '@/lib/validations/sync';
import type { FieldBundle, PhotoRef, VisitRecord } from '@/lib/field';
import type { ApplianceLookup } from '@/lib/field/record';
import type { PhotoMeta } from '@/lib/validations/inspection';
import { warmPages } from './service-worker';

export type Prefs = { tempUnit: 'C' | 'F'; powerUnit: 'kW' | 'Btu/h' };

export type FieldContextValue = {
  ready: boolean;
  storageError: string | null;
  bundle: FieldBundle | null;
  bundleError: string | null;
  records: Record<string, VisitRecord>;
  outbox: OutboxEntry[];
  online: boolean;
  syncing: boolean;
  lastOutcome: FlushOutcome | null;
  prefs: Prefs;
  db: FieldDb | null;
  commit: (mutation: Mutation, label: string) => Promise<void>;
  addPhoto: (input: { visitId: string; ref: PhotoRef & { purpose: PhotoMeta['purpose'] }; bytes: ArrayBuffer; mime: string; label: string }) => Promise<void>;
  retry: (seq?: number) => Promise<void>;
  syncNow: () => Promise<void>;
  setPreference: <K extends keyof Prefs>(key: K, value: Prefs[K]) => Promise<void>;
};

export const FieldContext = createContext<FieldContextValue | null>(null);

function subscribeOnline(callback: () => void) {
  window.addEventListener('online', callback);
  window.addEventListener('offline', callback);
  return () => {
    window.removeEventListener('online', callback);
    window.removeEventListener('offline', callback);
  };
}

const SENT_KEPT_MS = 7 * 86400_000;
const RETRY_TICK_MS = 5000;

/** One database per engineer, so a shared phone never shows one engineer's work to another. */
export function FieldProvider({ userId, children }: { userId: string; children: React.ReactNode }) {
  const [db, setDb] = useState<FieldDb | null>(null);
  const [storageError, setStorageError] = useState<string | null>(null);
  const [bundle, setBundle] = useState<FieldBundle | null>(null);
  const [records, setRecords] = useState<Record<string, VisitRecord>>({});
  const [outbox, setOutbox] = useState<OutboxEntry[]>([]);
  const online = useSyncExternalStore(subscribeOnline, () => navigator.onLine, () => true);
  const [syncing, setSyncing] = useState(false);
  const [lastOutcome, setLastOutcome] = useState<FlushOutcome | null>(null);
  const [prefs, setPrefs] = useState<Prefs>({ tempUnit: 'C', powerUnit: 'kW' });

  useEffect(() => {
    let cancelled = false;
    (async () => {
      try {
        const opened = await openFieldDb(`${FIELD_DB_NAME}-${userId}`);
        // Anything caught mid-send when the app was last closed goes back in the queue.
        await resetInterrupted(opened);
        await pruneSent(opened, new Date(Date.now() - SENT_KEPT_MS));
        const [cached, recs, entries, tempUnit, powerUnit] = await Promise.all([getBundle(opened), listRecords(opened), listEntries(opened), getPref(opened, 'tempUnit'), getPref(opened, 'powerUnit')]);
        if (cancelled) return;
        setBundle(cached);
        setRecords(Object.fromEntries(recs.map((r) => [r.visitId, r])));
        setOutbox(entries);
        setPrefs({ tempUnit: tempUnit === 'F' ? 'F' : 'C', powerUnit: powerUnit === 'Btu/h' ? 'Btu/h' : 'kW' });
        setDb(opened);
      } catch (err) {
        setStorageError(err instanceof Error ? err.message : 'This browser would not open its storage.');
      }
    })();
    return () => {
      cancelled = true;
    };
  }, [userId]);

  const { data: fresh, error: fetchError } = useSWR<FieldBundle>(db && online ? '/api/v1/field/visits' : null, (url: string) => fetchJson<FieldBundle>(url), {
    revalidateOnFocus: true,
    revalidateOnReconnect: true,
    refreshInterval: 5 * 60_000,
    shouldRetryOnError: false,
  });

  useEffect(() => {
    if (!db || !fresh) return;
    let cancelled = false;
    void saveBundle(db, fresh).then((merged) => {
      if (cancelled) return;
      setBundle(merged);
      void warmPages(['/field', ...merged.visits.map((v) => `/field/visits/${v.id}`)]);
    });
    return () => {
      cancelled = true;
    };
  }, [db, fresh]);

  const refreshOutbox = useCallback(async () => {
    if (db) setOutbox(await listEntries(db));
  }, [db]);

  const flushing = useRef(false);
  const syncNow = useCallback(async () => {
    if (!db || flushing.current || !navigator.onLine) return;
    flushing.current = true;
    setSyncing(true);
    try {
      const outcome = await flushExclusive(db, { fetch: (input, init) => fetch(input, init) });
      if (outcome) setLastOutcome(outcome);
    } finally {
      flushing.current = false;
      setSyncing(false);
      await refreshOutbox();
    }
  }, [db, refreshOutbox]);

  // Send whenever there is something to send: on start, on reconnect, and on a short tick while
  // anything waits (the outbox itself spaces out retries of a failing entry).
  const waiting = outbox.some((e) => e.status === 'pending' || e.status === 'failed');
  useEffect(() => {
    if (!db || !online) return;
    void syncNow();
  }, [db, online, syncNow]);
  useEffect(() => {
    if (!db || !online || !waiting) return;
    const timer = window.setInterval(() => void syncNow(), RETRY_TICK_MS);
    return () => window.clearInterval(timer);
  }, [db, online, waiting, syncNow]);

  const lookup: ApplianceLookup = useCallback(
    (applianceId: string) => {
      for (const visit of bundle?.visits ?? []) {
        const found = visit.appliances.find((a) => a.id === applianceId);
        if (found) return { details: found.details, updatedAt: found.updatedAt };
      }
      return null;
    },
    [bundle],
  );

  const commit = useCallback(
    async (mutation: Mutation, label: string) => {
      if (!db) throw new Error('The phone’s storage is not open yet; try again in a moment.');
      // A mutation the server would refuse is a bug here: stop it before it is saved and queued.
      // The schemas (zod) load on the first change rather than with the app's first screen.
      const { mutationSchema } = await import('@/lib/validations/sync');
      const checked = mutationSchema.parse(mutation);
      const { record } = await commitMutation(db, { mutation: checked, label, lookup });
      setRecords((current) => ({ ...current, [record.visitId]: record }));
      await refreshOutbox();
      void syncNow();
    },
    [db, lookup, refreshOutbox, syncNow],
  );

  const addPhoto = useCallback<FieldContextValue['addPhoto']>(
    async (input) => {
      if (!db) throw new Error('The phone’s storage is not open yet; try again in a moment.');
      const { record } = await commitPhoto(db, input);
      setRecords((current) => ({ ...current, [record.visitId]: record }));
      await refreshOutbox();
      void syncNow();
    },
    [db, refreshOutbox, syncNow],
  );

  const retry = useCallback(
    async (seq?: number) => {
      if (!db) return;
      await retryEntries(db, seq === undefined ? undefined : [seq]);
      await refreshOutbox();
      void syncNow();
    },
    [db, refreshOutbox, syncNow],
  );

  const setPreference = useCallback(
    async <K extends keyof Prefs>(key: K, value: Prefs[K]) => {
      setPrefs((p) => ({ ...p, [key]: value }));
      if (db) await setPref(db, key, value);
    },
    [db],
  );

  const value = useMemo<FieldContextValue>(
    () => ({
      ready: db !== null,
      storageError,
      bundle,
      bundleError: fetchError ? (fetchError instanceof Error ? fetchError.message : 'The visit list could not be fetched.') : null,
      records,
      outbox,
      online,
      syncing,
      lastOutcome,
      prefs,
      db,
      commit,
      addPhoto,
      retry,
      syncNow,
      setPreference,
    }),
    [db, storageError, bundle, fetchError, records, outbox, online, syncing, lastOutcome, prefs, commit, addPhoto, retry, syncNow, setPreference],
  );

  return <FieldContext.Provider value={value}>{children}</FieldContext.Provider>;
}
