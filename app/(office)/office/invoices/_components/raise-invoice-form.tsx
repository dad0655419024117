'use client';
// Raise a draft invoice from a visit: choose the visit and who pays, add extras, and see the lines
// and totals as they will be charged (the same pure functions the server uses).
import { useMemo, useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { createInvoiceSchema, type CreateInvoiceData, type CreateInvoiceInput } from '@/lib/validations/invoices';
import type { BillableVisit, InvoiceDetail } from '@/db/invoices';
import type { PriceList } from '@/db/prices';
import { buildVisitLines, BILLABLE_VISIT_KIND_LABELS, type BillableVisitKind } from '@/lib/billing/catalogue';
import { computeInvoiceTotals } from '@/lib/billing/totals';
import { formatMoney, formatRatePct } from '@/lib/billing/money';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, TextArea, applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['visitId', 'payerId', 'extras', 'notes'] as const;
const NO_EXTRAS: CreateInvoiceData['extras'] = [];

function visitLabel(v: BillableVisit): string {
  const day = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric' }).format(new Date(v.windowStart));
  return `${day} · ${BILLABLE_VISIT_KIND_LABELS[v.kind as BillableVisitKind] ?? v.kind} · ${v.siteAddress}`;
}

export function RaiseInvoiceForm({ visits, priceList, initialVisitId }: { visits: BillableVisit[]; priceList: PriceList; initialVisitId?: string }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const firstVisit = visits.find((v) => v.id === initialVisitId) ?? visits[0];
  const extras = priceList.items.filter((p) => p.kind === 'extra' && p.active);
  const { register, handleSubmit, setError, setValue, control, formState } = useForm<CreateInvoiceInput, unknown, CreateInvoiceData>({
    resolver: zodResolver(createInvoiceSchema),
    defaultValues: { visitId: firstVisit.id, payerId: firstVisit.payers[0]?.id ?? '', extras: [], notes: '' },
  });
  const e = formState.errors;
  const visitId = useWatch({ control, name: 'visitId' });
  const watchedExtras = useWatch({ control, name: 'extras' });
  const chosenExtras = watchedExtras ?? NO_EXTRAS;
  const visit = visits.find((v) => v.id === visitId) ?? firstVisit;
  const { currency, taxRateBp, taxLabel } = priceList.settings;

  const preview = useMemo(() => {
    const { lines, missing } = buildVisitLines({ visitKind: visit.kind, applianceCategories: visit.applianceCategories, prices: priceList.items, extras: watchedExtras ?? NO_EXTRAS });
    return { lines, missing, totals: computeInvoiceTotals({ lines, taxRateBp }) };
  }, [visit, watchedExtras, priceList.items, taxRateBp]);
  const money = (minor: number) => formatMoney(minor, currency);

  function quantityOf(priceId: string): number {
    return chosenExtras.find((x) => x.priceId === priceId)?.quantity ?? 0;
  }

  function setQuantity(priceId: string, quantity: number) {
    const rest = chosenExtras.filter((x) => x.priceId !== priceId);
    setValue('extras', quantity > 0 ? [...rest, { priceId, quantity }] : rest, { shouldValidate: true });
  }

  async function onSubmit(data: CreateInvoiceData) {
    setFailure('');
    try {
      const { invoice } = await fetchJson<{ invoice: InvoiceDetail }>('/api/v1/invoices', { method: 'POST', body: JSON.stringify(data) });
      router.push(`/office/invoices/${invoice.id}`);
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  const visitField = register('visitId');
  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="flex max-w-2xl flex-col gap-4">
      {failure ? <Alert tone="error">{failure}</Alert> : null}
      <Field id="visitId" label="Visit" error={e.visitId?.message}>
        <Select
          {...visitField}
          {...errorProps('visitId', e.visitId)}
          onChange={(event) => {
            void visitField.onChange(event);
            const next = visits.find((v) => v.id === event.target.value);
            setValue('payerId', next?.payers[0]?.id ?? '');
          }}
          options={visits.map((v) => ({ value: v.id, label: visitLabel(v) }))}
        />
      </Field>
      <p className="-mt-2 text-sm text-ink-soft" data-testid="chosen-visit">
        {visit.siteAddress} · {visit.applianceCategories.length} appliance{visit.applianceCategories.length === 1 ? '' : 's'} · visit {visit.status}
      </p>
      <Field id="payerId" label="Who pays" error={e.payerId?.message} hint="The landlord or homeowner of the property. The invoice and its pay link go to their e-mail.">
        <Select {...register('payerId')} {...errorProps('payerId', e.payerId)} options={visit.payers.map((p) => ({ value: p.id, label: `${p.name} (${p.role === 'landlord' ? 'landlord' : 'homeowner'})` }))} />
      </Field>

      {extras.length > 0 ? (
        <fieldset className="flex flex-col gap-2">
          <legend className="mb-1 text-sm font-semibold">Extras (how many)</legend>
          {extras.map((x) => (
            <div key={x.id} className="flex items-center gap-3">
              <label htmlFor={`extra-${x.id}`} className="flex-1 text-sm">
                {x.name} <span className="text-ink-soft">({money(x.unitAmountMinor)} each)</span>
              </label>
              <div className="w-20 shrink-0">
                <Input
                  id={`extra-${x.id}`}
                  type="number"
                  min={0}
                  max={99}
                  inputMode="numeric"
                  value={quantityOf(x.id)}
                  onChange={(event) => setQuantity(x.id, Math.max(0, Math.min(99, Math.trunc(Number(event.target.value) || 0))))}
                />
              </div>
            </div>
          ))}
          {e.extras ? <p className="text-sm font-semibold text-danger" role="alert">{e.extras.message ?? 'Check the extras'}</p> : null}
        </fieldset>
      ) : null}

      <Field id="notes" label="Note on the invoice (optional)" error={e.notes?.message}>
        <TextArea {...register('notes')} {...errorProps('notes', e.notes)} />
      </Field>

      <section aria-labelledby="preview-heading" className="rounded-xl border border-line bg-card p-3 shadow-sm">
        <h2 id="preview-heading" className="mb-2 font-bold">What will be charged</h2>
        {preview.missing.some((m) => m.startsWith('visit:')) ? (
          <Alert tone="warning">The price list has no active price for this visit type. Add one under Prices and tax first.</Alert>
        ) : null}
        {preview.missing.some((m) => m.startsWith('appliance:')) ? (
          <p className="mb-2 text-sm text-service">Some appliances have no price for their category and no default appliance price; they are not charged.</p>
        ) : null}
        <ul className="flex flex-col divide-y divide-line text-sm tabular" data-testid="invoice-preview">
          {preview.lines.map((line, i) => (
            <li key={`${line.priceId}-${i}`} className="flex gap-3 py-1.5">
              <span className="flex-1">
                {line.description}
                {line.quantity > 1 ? <span className="text-ink-soft"> × {line.quantity}</span> : null}
              </span>
              <span>{money(preview.totals.lineAmountsMinor[i])}</span>
            </li>
          ))}
        </ul>
        <dl className="mt-2 grid grid-cols-[1fr_auto] gap-x-4 text-sm tabular">
          <dt>Subtotal</dt>
          <dd className="text-right">{money(preview.totals.subtotalMinor)}</dd>
          <dt>
            {taxLabel} at {formatRatePct(taxRateBp)}%
          </dt>
          <dd className="text-right">{money(preview.totals.taxMinor)}</dd>
          <dt className="font-bold">Total</dt>
          <dd className="text-right font-bold">{money(preview.totals.totalMinor)}</dd>
        </dl>
      </section>

      <div>
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Saving…' : 'Save as draft'}
        </Button>
      </div>
    </form>
  );
}
