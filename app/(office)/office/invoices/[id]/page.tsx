import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getInvoice } from '@/db/invoices';
import { listInvoicePaymentEvents } from '@/db/payments';
import { formatDateOnly } from '@/lib/billing/dates';
import { formatMoney } from '@/lib/billing/money';
import { BILLABLE_VISIT_KIND_LABELS, type BillableVisitKind } from '@/lib/billing/catalogue';
import { InvoiceStatusBadge } from '@/components/billing/invoice-status-badge';
import { InvoiceLines } from '@/components/billing/invoice-lines';
import { Alert } from '@/components/ui/alert';
import { InvoiceActions } from '../_components/invoice-actions';

export const metadata: Metadata = { title: 'Invoice' };

const EVENT_LABELS: Record<string, string> = {
  'checkout.session.completed': 'Card payment received',
  'charge.refunded': 'Refund confirmed',
  'payment_intent.payment_failed': 'Card payment declined',
};

export default async function OfficeInvoicePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const invoice = await getInvoice({ organisationId: user.organisationId }, id);
  if (!invoice) notFound();
  const events = await listInvoicePaymentEvents({ organisationId: user.organisationId, invoiceId: invoice.id });
  const dateTime = (iso: string) => new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: invoice.organisation.timeZone }).format(new Date(iso));
  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm">
        <Link href="/office/invoices" className="text-copper underline underline-offset-4">
          Invoices
        </Link>
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-bold">Invoice {invoice.numberText}</h1>
        <InvoiceStatusBadge status={invoice.status} />
      </div>

      <dl className="grid grid-cols-1 gap-x-6 gap-y-2 rounded-xl border border-line bg-card p-3 text-sm shadow-sm sm:grid-cols-2">
        <div>
          <dt className="font-semibold text-ink-soft">Payer</dt>
          <dd>
            {invoice.payerName} ({invoice.payerRole === 'landlord' ? 'landlord' : 'homeowner'}) · {invoice.payerEmail}
          </dd>
        </div>
        <div>
          <dt className="font-semibold text-ink-soft">Property</dt>
          <dd>
            {invoice.siteAddress} {invoice.site.postcode}
          </dd>
        </div>
        <div>
          <dt className="font-semibold text-ink-soft">Visit</dt>
          <dd>
            {BILLABLE_VISIT_KIND_LABELS[invoice.visitKind as BillableVisitKind] ?? invoice.visitKind}
            {invoice.visitDate ? `, ${formatDateOnly(invoice.visitDate)}` : ''}
          </dd>
        </div>
        <div>
          <dt className="font-semibold text-ink-soft">Issued / due</dt>
          <dd>{invoice.issuedOn ? `${formatDateOnly(invoice.issuedOn)} · due ${formatDateOnly(invoice.dueOn ?? invoice.issuedOn)}` : 'Not yet sent'}</dd>
        </div>
      </dl>

      {invoice.status === 'sent' && invoice.lastPaymentError ? (
        <Alert tone="warning" title="The payer’s last card payment did not go through">
          {invoice.lastPaymentError}
        </Alert>
      ) : null}
      {invoice.status === 'void' && invoice.voidReason ? <Alert title="Void">{invoice.voidReason}</Alert> : null}
      {invoice.notes ? <p className="rounded-lg bg-white p-3 text-sm">{invoice.notes}</p> : null}

      <InvoiceLines invoice={invoice} />

      <InvoiceActions
        invoice={{
          id: invoice.id,
          status: invoice.status,
          currency: invoice.currency,
          payerEmail: invoice.payerEmail,
          paidBy: invoice.paidBy,
          canRefundByCard: Boolean(invoice.paymentIntentId),
          refundableMinor: invoice.amountPaidMinor - invoice.amountRefundedMinor,
          amountRefundedMinor: invoice.amountRefundedMinor,
        }}
      />

      <section aria-labelledby="events-heading" className="flex flex-col gap-2">
        <h2 id="events-heading" className="text-lg font-bold">Payment service events</h2>
        {events.length === 0 ? (
          <p className="text-sm text-ink-soft">
            {invoice.paidBy === 'bank_transfer' ? `Paid ${formatMoney(invoice.amountPaidMinor, invoice.currency)} by bank transfer, outside card payments.` : 'None yet.'}
          </p>
        ) : (
          <ul className="flex flex-col divide-y divide-line rounded-xl border border-line bg-card text-sm" data-testid="payment-events">
            {events.map((e) => (
              <li key={e.id} className="flex flex-wrap gap-x-3 px-3 py-2">
                <span className="font-semibold">{EVENT_LABELS[e.type] ?? e.type}</span>
                <span className="text-ink-soft">{dateTime(e.eventCreatedAt)}</span>
                <span className="ml-auto font-mono text-xs text-ink-soft">{e.id}</span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
