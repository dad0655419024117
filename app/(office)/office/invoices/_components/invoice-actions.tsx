'use client';
// What the office can do to one invoice: send (or send again), open the PDF, void it while unpaid,
// refund a card payment in part or in full. Refunds settle when the payment service confirms them,
// so after asking, the page refreshes until the confirmation has arrived.
import { useEffect, useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm, Controller } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { refundSchema, voidSchema, type RefundData, type VoidData } from '@/lib/validations/invoices';
import type { InvoiceStatus } from '@/lib/billing/status';
import { formatMoney, parseMoneyInput, toMajorText } from '@/lib/billing/money';
import { fetchJson } from '@/lib/fetch-json';
import { Field } from '@/components/ui/field';
import { Button, buttonClass } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { ParsedInput } from '@/components/billing/parsed-input';
import { TextArea, applyServerErrors, errorProps } from '../../_components/form-bits';

type ActionInvoice = {
  id: string;
  status: InvoiceStatus;
  currency: string;
  payerEmail: string;
  paidBy: 'card' | 'bank_transfer' | null;
  canRefundByCard: boolean;
  refundableMinor: number;
  amountRefundedMinor: number;
};

function RefundForm({ invoice, onRequested }: { invoice: ActionInvoice; onRequested: (message: string) => void }) {
  const [failure, setFailure] = useState('');
  const { control, handleSubmit, setError, setValue, formState } = useForm<RefundData>({
    resolver: zodResolver(refundSchema),
    // Empty to start with: a refund is typed or chosen on purpose, never one click away.
    defaultValues: { amountMinor: Number.NaN },
  });
  const e = formState.errors;

  async function onSubmit(data: RefundData) {
    setFailure('');
    try {
      const body = await fetchJson<{ message: string }>(`/api/v1/invoices/${invoice.id}/refund`, { method: 'POST', body: JSON.stringify(data) });
      onRequested(body.message);
    } catch (err) {
      setFailure(applyServerErrors(err, setError, ['amountMinor']));
    }
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="flex flex-col gap-3 rounded-xl border border-line bg-card p-3 shadow-sm" aria-labelledby="refund-heading">
      <h2 id="refund-heading" className="font-bold">Refund to the card</h2>
      {failure ? <Alert tone="error">{failure}</Alert> : null}
      <Field id="amountMinor" label={`Amount to refund (up to ${formatMoney(invoice.refundableMinor, invoice.currency)})`} error={e.amountMinor?.message}>
        <Controller
          control={control}
          name="amountMinor"
          render={({ field }) => (
            <ParsedInput
              {...errorProps('amountMinor', e.amountMinor)}
              name={field.name}
              onBlur={field.onBlur}
              value={field.value}
              onChange={field.onChange}
              parse={(text) => parseMoneyInput(text, invoice.currency)}
              format={(minor) => toMajorText(minor, invoice.currency)}
              className="max-w-40"
            />
          )}
        />
      </Field>
      <div className="flex flex-wrap gap-2">
        <Button type="button" variant="secondary" onClick={() => setValue('amountMinor', invoice.refundableMinor, { shouldValidate: true })}>
          Whole amount
        </Button>
        <Button type="submit" variant="danger" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Asking…' : 'Refund'}
        </Button>
      </div>
    </form>
  );
}

function VoidForm({ invoiceId, onDone }: { invoiceId: string; onDone: () => void }) {
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState } = useForm<VoidData>({ resolver: zodResolver(voidSchema), defaultValues: { reason: '' } });
  const e = formState.errors;
  async function onSubmit(data: VoidData) {
    setFailure('');
    try {
      await fetchJson(`/api/v1/invoices/${invoiceId}/void`, { method: 'POST', body: JSON.stringify(data) });
      onDone();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, ['reason']));
    }
  }
  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="flex flex-col gap-3 rounded-xl border border-line bg-card p-3 shadow-sm" aria-labelledby="void-heading">
      <h2 id="void-heading" className="font-bold">Void this invoice</h2>
      <p className="text-sm text-ink-soft">A void invoice keeps its number and can no longer be paid. The visit can then be invoiced again.</p>
      {failure ? <Alert tone="error">{failure}</Alert> : null}
      <Field id="reason" label="Why" error={e.reason?.message}>
        <TextArea {...register('reason')} {...errorProps('reason', e.reason)} rows={2} />
      </Field>
      <div>
        <Button type="submit" variant="secondary" disabled={formState.isSubmitting}>
          Void invoice
        </Button>
      </div>
    </form>
  );
}

export function InvoiceActions({ invoice }: { invoice: ActionInvoice }) {
  const router = useRouter();
  const [notice, setNotice] = useState<{ tone: 'success' | 'error' | 'info'; text: string } | null>(null);
  const [sending, setSending] = useState(false);
  const [waitingFrom, setWaitingFrom] = useState<number | null>(null);
  const [gaveUp, setGaveUp] = useState(false);
  const [showVoid, setShowVoid] = useState(false);
  // A refund is confirmed once the refunded total read from the server has moved.
  const confirmed = waitingFrom !== null && invoice.amountRefundedMinor !== waitingFrom;
  const waiting = waitingFrom !== null && !confirmed && !gaveUp;

  // While a refund is being confirmed, re-read the page every second and a half (up to ~20 s).
  useEffect(() => {
    if (!waiting) return;
    let tries = 0;
    const timer = setInterval(() => {
      tries += 1;
      if (tries > 13) {
        clearInterval(timer);
        setGaveUp(true);
        return;
      }
      router.refresh();
    }, 1500);
    return () => clearInterval(timer);
  }, [waiting, router]);

  const shown = confirmed
    ? { tone: 'success' as const, text: 'The payment service confirmed the refund.' }
    : gaveUp
      ? { tone: 'info' as const, text: 'The refund is requested; the confirmation has not arrived yet. This page shows it once it does.' }
      : notice;

  async function send() {
    setSending(true);
    setNotice(null);
    setWaitingFrom(null);
    try {
      await fetchJson(`/api/v1/invoices/${invoice.id}/send`, { method: 'POST', body: '{}' });
      setNotice({ tone: 'success', text: `Sent to ${invoice.payerEmail}, with the PDF and a link to pay online.` });
      router.refresh();
    } catch (err) {
      setNotice({ tone: 'error', text: (err as Error).message });
    } finally {
      setSending(false);
    }
  }

  const refundable = (invoice.status === 'paid' || invoice.status === 'partly_refunded') && invoice.refundableMinor > 0;
  return (
    <section aria-label="Invoice actions" className="flex flex-col gap-3">
      <div aria-live="polite">{shown ? <Alert tone={shown.tone}>{shown.text}</Alert> : null}</div>
      {waiting ? <p className="text-sm text-ink-soft" role="status">Waiting for the payment service to confirm the refund…</p> : null}
      <div className="flex flex-wrap gap-2">
        {invoice.status === 'draft' || invoice.status === 'sent' ? (
          <Button type="button" onClick={send} disabled={sending}>
            {sending ? 'Sending…' : invoice.status === 'draft' ? 'Send to payer' : 'Send again'}
          </Button>
        ) : null}
        <a href={`/api/v1/invoices/${invoice.id}/pdf`} className={buttonClass('secondary')} target="_blank" rel="noopener">
          Open PDF
        </a>
        {(invoice.status === 'draft' || invoice.status === 'sent') && !showVoid ? (
          <Button type="button" variant="ghost" onClick={() => setShowVoid(true)}>
            Void…
          </Button>
        ) : null}
      </div>
      {showVoid && (invoice.status === 'draft' || invoice.status === 'sent') ? (
        <VoidForm
          invoiceId={invoice.id}
          onDone={() => {
            setShowVoid(false);
            setNotice({ tone: 'info', text: 'The invoice is void.' });
            router.refresh();
          }}
        />
      ) : null}
      {refundable && invoice.canRefundByCard ? (
        <RefundForm
          key={invoice.amountRefundedMinor}
          invoice={invoice}
          onRequested={(message) => {
            setNotice({ tone: 'info', text: message });
            setGaveUp(false);
            setWaitingFrom(invoice.amountRefundedMinor);
          }}
        />
      ) : null}
      {refundable && !invoice.canRefundByCard ? (
        <p className="text-sm text-ink-soft">This invoice was paid by bank transfer. Refund it the same way, outside Hearthmark.</p>
      ) : null}
    </section>
  );
}
