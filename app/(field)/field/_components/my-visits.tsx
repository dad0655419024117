'use client';
// Today's and upcoming visits assigned to the engineer. The server draws the first list (so it shows
// before any script runs); once the phone's saved copy opens, that copy is shown, refreshed from
// /api/v1/field/visits when online.
import Link from 'next/link';
import type { FieldVisit, VisitRecord } from '@/lib/field';
import { localDate } from '@/lib/field';
import { Alert } from '@/components/ui/alert';
import { SyncStatus } from './sync-status';
import { useField } from './use-field';

const KIND_LABELS: Record<string, string> = { annual_check: 'Annual check', service: 'Service', breakdown: 'Breakdown', follow_up: 'Follow-up' };

/** What one card shows: the server sends only this, the phone derives it from its saved visit. */
export type VisitSummary = Pick<FieldVisit, 'id' | 'status' | 'kind' | 'windowStart' | 'windowEnd'> & {
  site: Pick<FieldVisit['site'], 'address' | 'town' | 'postcode' | 'reference' | 'accessNotes'>;
  applianceCount: number;
};

function summaryOf(v: FieldVisit): VisitSummary {
  return { ...v, applianceCount: v.appliances.length };
}

function timeRange(v: VisitSummary, timeZone: string): string {
  const t = (iso: string) => new Date(iso).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit', timeZone });
  return `${t(v.windowStart)}–${t(v.windowEnd)}`;
}

function dayHeading(date: string, today: string): string {
  if (date === today) return 'Today';
  return new Date(`${date}T12:00:00Z`).toLocaleDateString('en-GB', { weekday: 'long', day: 'numeric', month: 'long', timeZone: 'UTC' });
}

function stateOf(v: VisitSummary, record: VisitRecord | undefined): { text: string; tone: string } {
  if (record?.noAccess || v.status === 'no_access') return { text: 'No access', tone: 'border-unknown text-unknown' };
  if (v.status === 'submitted' || v.status === 'certified') return { text: v.status === 'certified' ? 'Certified' : 'Submitted', tone: 'border-clear text-clear' };
  if (record?.submittedAt) return { text: 'Submitted on this phone', tone: 'border-clear text-clear' };
  if (record?.arrivedAt || v.status === 'on_site') return { text: 'In progress', tone: 'border-copper text-copper' };
  return { text: 'Booked', tone: 'border-line text-ink-soft' };
}

export function MyVisits({ initial }: { initial?: { visits: VisitSummary[]; timeZone: string } }) {
  const { bundle, bundleError, records, ready, storageError, online } = useField();
  // Until the phone's copy opens (and on the first render, which must match the server's HTML),
  // the server's list is shown; a phone with no saved copy yet keeps it until the fetch lands.
  const shown = bundle ? { visits: bundle.visits.map(summaryOf), timeZone: bundle.timeZone } : (initial ?? null);
  const timeZone = shown?.timeZone ?? 'UTC';
  const today = localDate(new Date().toISOString(), timeZone);
  const visits = shown?.visits ?? [];
  const groups = new Map<string, VisitSummary[]>();
  for (const v of [...visits].sort((a, b) => a.windowStart.localeCompare(b.windowStart))) {
    const d = localDate(v.windowStart, timeZone);
    const key = d < today ? 'earlier' : d;
    groups.set(key, [...(groups.get(key) ?? []), v]);
  }

  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-2xl font-bold">My visits</h1>
      <SyncStatus />
      {storageError ? <Alert tone="error" title="This phone’s storage could not be opened">{storageError} Recording offline needs it: check the browser is not in private mode.</Alert> : null}
      {bundleError && online ? <Alert tone="warning" title="Could not refresh the list">{bundleError} The list below is the one saved on this phone.</Alert> : null}
      {ready && !shown ? (
        <Alert tone="info" title={online ? 'Fetching your visits…' : 'No visits saved on this phone yet'}>
          {online ? null : 'Open the app once with a signal to save your visits for offline work.'}
        </Alert>
      ) : null}
      {shown && visits.length === 0 ? <p className="text-ink-soft">Nothing booked for you in the next two weeks.</p> : null}
      {bundle ? <p className="text-xs text-ink-soft">Saved on this phone {new Date(bundle.fetchedAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone })}</p> : null}
      {[...groups.entries()].map(([key, list]) => (
        <section key={key} aria-labelledby={`day-${key}`} className="flex flex-col gap-2">
          <h2 id={`day-${key}`} className="text-lg font-bold">
            {key === 'earlier' ? 'Earlier, still open' : dayHeading(key, today)}
          </h2>
          <ul className="flex flex-col gap-2">
            {list.map((v) => {
              const state = stateOf(v, records[v.id]);
              return (
                <li key={v.id}>
                  <Link href={`/field/visits/${v.id}`} className="block rounded-xl border border-line bg-card p-3 shadow-sm active:bg-copper-soft" data-testid="visit-card">
                    <div className="flex items-center justify-between gap-2">
                      <p className="text-sm font-semibold text-copper-dark">
                        {timeRange(v, timeZone)} · {KIND_LABELS[v.kind] ?? v.kind}
                      </p>
                      <span className={`rounded border px-1.5 py-0.5 text-xs font-bold ${state.tone}`}>{state.text}</span>
                    </div>
                    <p className="text-lg font-bold">{v.site.address}</p>
                    <p className="text-sm text-ink-soft">
                      {v.site.town} {v.site.postcode} · {v.site.reference} · {v.applianceCount} {v.applianceCount === 1 ? 'appliance' : 'appliances'}
                    </p>
                    {v.site.accessNotes ? <p className="mt-1 text-sm">Access: {v.site.accessNotes}</p> : null}
                  </Link>
                </li>
              );
            })}
          </ul>
        </section>
      ))}
    </div>
  );
}
