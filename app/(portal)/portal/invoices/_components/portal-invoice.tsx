'use client';
// The payer's view of one invoice: what it is for, what is owed, and a card payment button. After
// the hosted payment page sends the payer back, the invoice is re-read until the payment service's
// confirmation has arrived, so "paid" shows only once it is true.
import { useState } from 'react';
import useSWR from 'swr';
import type { InvoiceDetail } from '@/db/invoices';
import { fetchJson } from '@/lib/fetch-json';
import { formatMoney } from '@/lib/billing/money';
import { formatDateOnly } from '@/lib/billing/dates';
import { BILLABLE_VISIT_KIND_LABELS, type BillableVisitKind } from '@/lib/billing/catalogue';
import { InvoiceStatusBadge } from '@/components/billing/invoice-status-badge';
import { InvoiceLines } from '@/components/billing/invoice-lines';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClass } from '@/components/ui/button';

const CONFIRM_POLL_MS = 1500;
const CONFIRM_GIVE_UP_MS = 30_000;

export function PortalInvoice({ initial, checkout }: { initial: InvoiceDetail; checkout: 'done' | 'cancelled' | null }) {
  const [startedAt] = useState(() => Date.now());
  const [paying, setPaying] = useState(false);
  const [payError, setPayError] = useState('');
  const { data } = useSWR(`/api/v1/invoices/${initial.id}`, (url: string) => fetchJson<{ invoice: InvoiceDetail }>(url), {
    fallbackData: { invoice: initial },
    revalidateOnMount: false,
    refreshInterval: (latest) => (checkout === 'done' && latest?.invoice.status === 'sent' && Date.now() - startedAt < CONFIRM_GIVE_UP_MS ? CONFIRM_POLL_MS : 0),
  });
  const invoice = data?.invoice ?? initial;
  const money = (minor: number) => formatMoney(minor, invoice.currency);
  const confirming = checkout === 'done' && invoice.status === 'sent';

  async function pay() {
    setPaying(true);
    setPayError('');
    try {
      const { url } = await fetchJson<{ url: string }>(`/api/v1/invoices/${invoice.id}/checkout`, { method: 'POST', body: '{}' });
      window.location.assign(url);
    } catch (err) {
      setPayError((err as Error).message);
      setPaying(false);
    }
  }

  return (
    <>
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="text-2xl font-bold">Invoice {invoice.numberText}</h1>
        <InvoiceStatusBadge status={invoice.status} />
      </div>
      <p className="text-sm text-ink-soft">
        From {invoice.organisation.name} for the {(BILLABLE_VISIT_KIND_LABELS[invoice.visitKind as BillableVisitKind] ?? invoice.visitKind).toLowerCase()}
        {invoice.visitDate ? ` on ${formatDateOnly(invoice.visitDate)}` : ''} at {invoice.siteAddress}.
      </p>

      <div aria-live="polite" className="flex flex-col gap-2">
        {checkout === 'done' && invoice.status === 'paid' ? (
          <Alert tone="success" title="Payment received, thank you">
            A receipt is on its way to {invoice.payerEmail}.
          </Alert>
        ) : null}
        {confirming ? (
          <Alert title="Confirming your payment…">We are waiting for the card payment service to confirm it. This page updates by itself.</Alert>
        ) : null}
        {checkout === 'cancelled' && invoice.status === 'sent' && !invoice.lastPaymentError ? <Alert>You left the payment page. Nothing was charged.</Alert> : null}
        {invoice.status === 'sent' && invoice.lastPaymentError && !confirming ? (
          <Alert tone="error" title="Your card payment did not go through">
            {invoice.lastPaymentError} You can try again, with another card if need be.
          </Alert>
        ) : null}
      </div>

      {invoice.status === 'sent' ? (
        <section aria-labelledby="pay-heading" className="flex flex-col gap-2 rounded-xl border-2 border-copper bg-card p-3 shadow-sm">
          <h2 id="pay-heading" className="text-lg font-bold">
            {money(invoice.totalMinor)} to pay{invoice.dueOn ? ` by ${formatDateOnly(invoice.dueOn)}` : ''}
          </h2>
          {payError ? <Alert tone="error">{payError}</Alert> : null}
          <Button type="button" onClick={pay} disabled={paying || confirming} className="w-full sm:w-auto">
            {paying ? 'Opening the payment page…' : `Pay ${money(invoice.totalMinor)} by card`}
          </Button>
          <p className="text-xs text-ink-soft">You pay on the card payment service’s secure page, then come back here.</p>
        </section>
      ) : null}
      {invoice.status === 'void' ? <Alert title="This invoice is void">There is nothing to pay on it.</Alert> : null}
      {invoice.status === 'refunded' || invoice.status === 'partly_refunded' ? (
        <Alert title={invoice.status === 'refunded' ? 'Refunded' : 'Partly refunded'}>
          {money(invoice.amountRefundedMinor)} has been refunded{invoice.paidBy === 'card' ? ' to your card' : ''}.
        </Alert>
      ) : null}

      <InvoiceLines invoice={invoice} />

      <div>
        <a href={`/api/v1/invoices/${invoice.id}/pdf`} className={buttonClass('secondary')} target="_blank" rel="noopener">
          Download PDF
        </a>
      </div>
    </>
  );
}
