import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { listOpenDangerFindings } from '@/db/dashboard';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { ListFrame, ListItem } from '../_components/list-frame';
import { organisationToday } from '../_components/today';

export const metadata: Metadata = { title: 'Open danger findings' };

export default async function DangerPage() {
  const user = await requirePageRole(['office']);
  const today = await organisationToday(user.organisationId);
  const rows = await listOpenDangerFindings({ organisationId: user.organisationId, today });
  return (
    <ListFrame title="Open danger findings" count={rows.length} note="oldest first; open until a later check is no longer danger" testId="danger-list">
      {rows.map((r) => (
        <ListItem key={r.id}>
          <p className="flex flex-wrap items-center gap-2">
            <VerdictBadge level="danger" size="sm" />
            <span className="font-bold">Open {r.daysOpen} {r.daysOpen === 1 ? 'day' : 'days'}</span>
            <Link href={`/office/sites/${r.siteId}`} className="underline">{r.siteReference}</Link>
            <span className="text-ink-soft">{r.address}</span>
          </p>
          <p className="mt-1">{r.description}</p>
          <p className="text-ink-soft">
            Recorded {r.recordedAt.slice(0, 10)} · action: {r.action.replaceAll('_', ' ')}
            {r.applianceId ? (
              <>
                {' · '}
                <Link href={`/office/insight/appliances/${r.applianceId}`} className="underline">appliance history</Link>
              </>
            ) : null}
          </p>
        </ListItem>
      ))}
    </ListFrame>
  );
}
