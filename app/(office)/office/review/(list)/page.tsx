import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { listReviewQueue } from '@/db/certificates';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SafetyCaution } from '@/components/safety/caution';

export const metadata: Metadata = { title: 'Review' };

function when(iso: string | null): string {
  return iso ? new Date(iso).toLocaleString('en-GB', { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', timeZone: 'Europe/London' }) : '—';
}

export default async function ReviewQueuePage() {
  const user = await requirePageRole(['office']);
  const items = await listReviewQueue(user.organisationId);
  return (
    <div className="flex flex-col gap-4" data-testid="review-queue">
      <div>
        <h1 className="text-2xl font-bold">Review</h1>
        <p className="text-ink-soft">
          {items.length === 0 ? 'No submitted visits are waiting.' : `${items.length} submitted visit${items.length === 1 ? '' : 's'} waiting for a certificate, oldest first.`}
        </p>
      </div>
      <ul className="flex flex-col gap-2">
        {items.map((v) => (
          <li key={v.visitId}>
            <Link href={`/office/review/${v.visitId}`} className="flex flex-wrap items-center gap-x-4 gap-y-1 rounded-xl border border-line bg-card p-3 shadow-sm hover:border-copper" data-testid="review-item">
              <span className="min-w-0 flex-1">
                <span className="block font-bold">{v.address}, {v.town}</span>
                <span className="block text-sm text-ink-soft">
                  {v.siteReference} · {v.engineerName ?? 'No engineer'} · submitted {when(v.submittedAt)}
                  {v.replacesNumberText ? ` · replaces void ${v.replacesNumberText}` : ''}
                </span>
              </span>
              <VerdictBadge level={v.overallVerdict ?? 'unknown'} size="sm" />
            </Link>
          </li>
        ))}
      </ul>
      <SafetyCaution compact />
    </div>
  );
}
