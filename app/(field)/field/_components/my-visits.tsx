'use client';
// Today's and upcoming visits assigned to the engineer, from the phone's saved copy.
import Link from 'next/link';
import type { FieldVisit, VisitRecord } from '@/lib/field';
import { localDate } from '@/lib/field';
import { Alert } from '@/components/ui/alert';
import { SyncStatus } from './sync-status';
import { useField } from './use-field';

const KIND_LABELS: Record<string, string> = { annual_check: 'Annual check', service: 'Service', breakdown: 'Breakdown', follow_up: 'Follow-up' };

function timeRange(v: FieldVisit, timeZone: string): string {
  const t = (iso: string) => new Date(iso).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit', timeZone });
  return `${t(v.windowStart)}–${t(v.windowEnd)}`;
}

function dayHeading(date: string, today: string): string {
  if (date === today) return 'Today';
  return new Date(`${date}T12:00:00Z`).toLocaleDateString('en-GB', { weekday: 'long', day: 'numeric', month: 'long', timeZone: 'UTC' });
}

function stateOf(v: FieldVisit, record: VisitRecord | undefined): { text: string; tone: string } {
  if (record?.noAccess || v.status === 'no_access') return { text: 'No access', tone: 'border-unknown text-unknown' };
  if (v.status === 'submitted' || v.status === 'certified') return { text: v.status === 'certified' ? 'Certified' : 'Submitted', tone: 'border-clear text-clear' };
  if (record?.submittedAt) return { text: 'Submitted on this phone', tone: 'border-clear text-clear' };
  if (record?.arrivedAt || v.status === 'on_site') return { text: 'In progress', tone: 'border-copper text-copper' };
  return { text: 'Booked', tone: 'border-line text-ink-soft' };
}

export function MyVisits() {
  const { bundle, bundleError, records, ready, storageError, online } = useField();
  const timeZone = bundle?.timeZone ?? 'UTC';
  const today = localDate(new Date().toISOString(), timeZone);
  const visits = bundle?.visits ?? [];
  const groups = new Map<string, FieldVisit[]>();
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
      {ready && !bundle ? (
        <Alert tone="info" title={online ? 'Fetching your visits…' : 'No visits saved on this phone yet'}>
          {online ? null : 'Open the app once with a signal to save your visits for offline work.'}
        </Alert>
      ) : null}
      {bundle && visits.length === 0 ? <p className="text-ink-soft">Nothing booked for you in the next two weeks.</p> : null}
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
                      {v.site.town} {v.site.postcode} · {v.site.reference} · {v.appliances.length} {v.appliances.length === 1 ? 'appliance' : 'appliances'}
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
