import type { Metadata } from 'next';
import { z } from 'zod';
import { requirePageRole } from '@/lib/auth/session';
import { DASHBOARD_PERIOD_MONTHS, listPaidInvoices, listUnpaidInvoices } from '@/db/dashboard';
import { formatMoney } from '@/lib/billing/money';
import { ListFrame, ListItem } from '../_components/list-frame';
import { organisationToday } from '../_components/today';

export const metadata: Metadata = { title: 'Invoices' };

const stateSchema = z.enum(['paid', 'unpaid']).catch('unpaid');

export default async function InvoicesPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePageRole(['office']);
  const state = stateSchema.parse((await searchParams).state);
  const today = await organisationToday(user.organisationId);
  if (state === 'paid') {
    const rows = await listPaidInvoices({ organisationId: user.organisationId, today });
    return (
      <ListFrame title="Paid invoices" count={rows.length} note={`paid in the last ${DASHBOARD_PERIOD_MONTHS} months, less refunds`} testId="paid-list">
        {rows.map((r) => (
          <ListItem key={r.id}>
            <span className="font-bold">No. {r.number}</span> · {r.siteReference} · {r.payerName}
            <span className="block text-ink-soft">Paid {r.paidAt.slice(0, 10)} · {formatMoney(r.netMinor, r.currency)}</span>
          </ListItem>
        ))}
      </ListFrame>
    );
  }
  const rows = await listUnpaidInvoices({ organisationId: user.organisationId, today });
  return (
    <ListFrame title="Unpaid invoices" count={rows.length} note="sent and not yet paid in full" testId="unpaid-list">
      {rows.map((r) => (
        <ListItem key={r.id}>
          <span className="font-bold">No. {r.number}</span> · {r.siteReference} · {r.payerName}
          <span className="block text-ink-soft">
            {formatMoney(r.outstandingMinor, r.currency)} outstanding · due {r.dueOn ?? '—'}
            {r.overdue ? <strong className="ml-1 text-danger">overdue</strong> : null}
          </span>
        </ListItem>
      ))}
    </ListFrame>
  );
}
