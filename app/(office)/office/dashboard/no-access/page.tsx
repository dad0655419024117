import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { DASHBOARD_PERIOD_MONTHS, listNoAccessVisits } from '@/db/dashboard';
import { ListFrame, ListItem } from '../_components/list-frame';
import { organisationToday } from '../_components/today';

export const metadata: Metadata = { title: 'No-access visits' };

export default async function NoAccessPage() {
  const user = await requirePageRole(['office']);
  const today = await organisationToday(user.organisationId);
  const rows = await listNoAccessVisits({ organisationId: user.organisationId, today });
  return (
    <ListFrame title="No-access visits" count={rows.length} note={`last ${DASHBOARD_PERIOD_MONTHS} months`} testId="no-access-list">
      {rows.map((r) => (
        <ListItem key={r.visitId}>
          <Link href={`/office/sites/${r.siteId}`} className="font-bold underline">{r.siteReference}</Link> · {r.address}
          <span className="block text-ink-soft">
            {r.at.slice(0, 10)}
            {r.engineerName ? ` · ${r.engineerName}` : ''}
            {r.note ? ` · ${r.note}` : ''}
          </span>
        </ListItem>
      ))}
    </ListFrame>
  );
}
