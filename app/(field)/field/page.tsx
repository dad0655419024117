import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { listEngineerVisits } from '@/db/visits';

export const metadata: Metadata = { title: 'My visits' };
export const dynamic = 'force-dynamic';

function dayLabel(iso: string): string {
  return new Date(iso).toLocaleDateString('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' });
}

export default async function FieldHome() {
  const user = await requirePageRole(['engineer']);
  const start = new Date();
  start.setUTCHours(0, 0, 0, 0);
  const end = new Date(start.getTime() + 14 * 86400_000);
  const visits = await listEngineerVisits({ organisationId: user.organisationId, engineerId: user.id, fromIso: start.toISOString(), toIso: end.toISOString() });
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-2xl font-bold">My visits</h1>
      {visits.length === 0 ? <p className="text-ink-soft">Nothing booked for you in the next two weeks.</p> : null}
      <ul className="flex flex-col gap-2">
        {visits.map((v) => (
          <li key={v.id} className="rounded-xl border border-line bg-card p-3 shadow-sm" data-testid="visit-card">
            <p className="text-sm font-semibold text-copper">
              {dayLabel(v.windowStart)} · {new Date(v.windowStart).toISOString().slice(11, 16)}–{new Date(v.windowEnd).toISOString().slice(11, 16)}
            </p>
            <p className="font-bold">{v.address}</p>
            <p className="text-sm text-ink-soft">
              {v.town} {v.postcode} · {v.siteReference}
            </p>
            {v.accessNotes ? <p className="mt-1 text-sm">Access: {v.accessNotes}</p> : null}
          </li>
        ))}
      </ul>
    </div>
  );
}
