import Link from 'next/link';
import type { RenewalRow } from '@/db/dashboard';
import { ListFrame, ListItem } from './list-frame';

export function RenewalList({ title, rows, note, testId }: { title: string; rows: RenewalRow[]; note: string; testId: string }) {
  return (
    <ListFrame title={title} count={rows.length} note={note} testId={testId}>
      {rows.map((r) => (
        <ListItem key={r.siteId}>
          <Link href={`/office/sites/${r.siteId}`} className="font-bold underline">{r.siteReference}</Link> · {r.address}
          <span className="block text-ink-soft">
            {r.daysLeft < 0 ? `Expired ${r.expiresOn}, ${-r.daysLeft} days ago` : `Expires ${r.expiresOn}, in ${r.daysLeft} days`}
            {r.basis === 'policy' ? ' (worked out from the last certified check)' : ''}
          </span>
        </ListItem>
      ))}
    </ListFrame>
  );
}
