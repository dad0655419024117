import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { invoiceAudience } from '@/lib/billing/audience';
import { listInvoices } from '@/db/invoices';
import { formatMoney } from '@/lib/billing/money';
import { formatDateOnly } from '@/lib/billing/dates';
import { InvoiceStatusBadge } from '@/components/billing/invoice-status-badge';

export const metadata: Metadata = { title: 'My invoices' };

export default async function PortalInvoicesPage() {
  const user = await requirePageRole(['landlord', 'homeowner']);
  const page = await listInvoices(invoiceAudience(user), { page: 1, pageSize: 100, sort: 'number', dir: 'desc' });
  const unpaid = page.items.filter((i) => i.status === 'sent');
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-2xl font-bold">My invoices</h1>
      {unpaid.length > 0 ? (
        <p className="text-ink-soft">
          {unpaid.length === 1 ? 'One invoice is' : `${unpaid.length} invoices are`} waiting to be paid. You can pay by card online.
        </p>
      ) : null}
      {page.items.length === 0 ? <p className="text-ink-soft">You have no invoices yet.</p> : null}
      <ul className="flex flex-col gap-2" aria-label="Invoices">
        {page.items.map((i) => (
          <li key={i.id} data-testid="portal-invoice">
            <Link href={`/portal/invoices/${i.id}`} className="flex flex-col gap-1 rounded-xl border border-line bg-card p-3 shadow-sm hover:border-ink-soft">
              <span className="flex flex-wrap items-center gap-2">
                <span className="font-bold">{i.numberText}</span>
                <InvoiceStatusBadge status={i.status} />
                <span className="ml-auto text-lg font-bold tabular">{formatMoney(i.totalMinor, i.currency)}</span>
              </span>
              <span className="text-sm text-ink-soft">{i.siteAddress}</span>
              <span className="text-sm">
                {i.status === 'sent' && i.dueOn ? `Due by ${formatDateOnly(i.dueOn)}` : i.issuedOn ? `Issued ${formatDateOnly(i.issuedOn)}` : ''}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </div>
  );
}
