'use client';
// The price list: a price per visit type, per appliance category (with a default for the rest),
// extras, and the tax rate, terms and number prefix. One form, one PUT, the same schema as the API.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { Controller, useFieldArray, useForm, type Control, type FieldErrors } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { priceListSchema, type PriceListData, type PriceListInput } from '@/lib/validations/prices';
import type { PriceList } from '@/db/prices';
import {
  APPLIANCE_PRICE_CODES,
  BILLABLE_VISIT_KINDS,
  BILLABLE_VISIT_KIND_LABELS,
  appliancePriceLabel,
  type AppliancePriceCode,
  type BillableVisitKind,
  type PriceKind,
} from '@/lib/billing/catalogue';
import { formatRatePct, parseMoneyInput, parseRatePct, toMajorText } from '@/lib/billing/money';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { ParsedInput } from '@/components/billing/parsed-input';
import { Select, applyServerErrors, errorProps } from '../../_components/form-bits';

type Item = PriceListInput['items'][number];

function withVisitRows(items: PriceList['items']): Item[] {
  // Every visit type gets a row (not in use until priced), so a missing price is one box to fill.
  const rows: Item[] = items.map((i) => ({ ...i }));
  for (const kind of BILLABLE_VISIT_KINDS) {
    if (!rows.some((r) => r.kind === 'visit' && r.code === kind)) {
      rows.push({ id: null, kind: 'visit', code: kind, name: BILLABLE_VISIT_KIND_LABELS[kind], unitAmountMinor: 0, active: false });
    }
  }
  return rows;
}

function codeLabel(kind: PriceKind, code: string | null | undefined): string {
  if (kind === 'visit') return BILLABLE_VISIT_KIND_LABELS[code as BillableVisitKind] ?? String(code);
  if (kind === 'appliance') return appliancePriceLabel(code as AppliancePriceCode);
  return '';
}

function PriceRow({ index, item, control, errors, currency, onRemove }: {
  index: number;
  item: Item;
  control: Control<PriceListInput, unknown, PriceListData>;
  errors: FieldErrors<PriceListInput>;
  currency: string;
  onRemove?: () => void;
}) {
  const e = errors.items?.[index];
  const label = codeLabel(item.kind, item.code);
  return (
    <li className="flex flex-col gap-2 border-t border-line py-3 first:border-t-0" data-testid={`price-${item.kind}`}>
      {label ? <p className="font-bold">{label}</p> : null}
      <div className="grid grid-cols-1 gap-2 sm:grid-cols-[1fr_auto] sm:items-start">
        <Field id={`items.${index}.name`} label="Name on invoice" error={e?.name?.message ?? e?.code?.message}>
          <Controller control={control} name={`items.${index}.name`} render={({ field }) => <Input {...field} {...errorProps(`items.${index}.name`, e?.name)} />} />
        </Field>
        <div className="flex flex-wrap items-start gap-3">
          <div className="w-32">
            <Field id={`items.${index}.unitAmountMinor`} label={`Price (${currency})`} error={e?.unitAmountMinor?.message}>
              <Controller
                control={control}
                name={`items.${index}.unitAmountMinor`}
                render={({ field }) => (
                  <ParsedInput
                    {...errorProps(`items.${index}.unitAmountMinor`, e?.unitAmountMinor)}
                    name={field.name}
                    onBlur={field.onBlur}
                    value={field.value}
                    onChange={field.onChange}
                    parse={(text) => parseMoneyInput(text, currency)}
                    format={(minor) => toMajorText(minor, currency)}
                    placeholder="0.00"
                  />
                )}
              />
            </Field>
          </div>
          <div className="flex items-center gap-1 pt-6">
            <Controller
              control={control}
              name={`items.${index}.active`}
              render={({ field }) => (
                <label className="inline-flex min-h-11 items-center gap-2 px-1 text-sm">
                  <input type="checkbox" className="h-5 w-5 accent-copper" checked={Boolean(field.value)} onChange={(ev) => field.onChange(ev.target.checked)} />
                  In use
                </label>
              )}
            />
            {onRemove ? (
              <Button type="button" variant="ghost" onClick={onRemove} aria-label={`Remove ${item.name || label || 'this price'}`}>
                Remove
              </Button>
            ) : null}
          </div>
        </div>
      </div>
    </li>
  );
}

export function PriceListForm({ initial }: { initial: PriceList }) {
  const router = useRouter();
  const [notice, setNotice] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const currency = initial.settings.currency;
  const { control, handleSubmit, setError, formState, reset, register } = useForm<PriceListInput, unknown, PriceListData>({
    resolver: zodResolver(priceListSchema),
    defaultValues: {
      taxRateBp: initial.settings.taxRateBp,
      taxLabel: initial.settings.taxLabel,
      paymentTermsDays: initial.settings.paymentTermsDays,
      invoicePrefix: initial.settings.invoicePrefix,
      items: withVisitRows(initial.items),
    },
  });
  const { fields, append, remove } = useFieldArray({ control, name: 'items', keyName: 'key' });
  const e = formState.errors;
  const usedApplianceCodes = new Set(fields.filter((f) => f.kind === 'appliance').map((f) => f.code));
  const [newCategory, setNewCategory] = useState('');
  const openCategories = APPLIANCE_PRICE_CODES.filter((c) => !usedApplianceCodes.has(c));

  async function onSubmit(data: PriceListData) {
    setNotice(null);
    try {
      const saved = await fetchJson<PriceList>('/api/v1/prices', { method: 'PUT', body: JSON.stringify(data) });
      reset({ ...saved.settings, items: withVisitRows(saved.items) });
      setNotice({ tone: 'success', text: 'Prices saved. New invoices use them from now on.' });
      router.refresh();
    } catch (err) {
      const message = applyServerErrors(err, setError, ['taxRateBp', 'taxLabel', 'paymentTermsDays', 'invoicePrefix', ...fields.flatMap((_, i) => [`items.${i}.name`, `items.${i}.unitAmountMinor`, `items.${i}.code`])]);
      setNotice({ tone: 'error', text: message || 'Some prices need attention: see the marked boxes.' });
    }
  }

  const section = (kind: PriceKind) => fields.map((f, index) => ({ f, index })).filter(({ f }) => f.kind === kind);
  return (
    <form onSubmit={handleSubmit(onSubmit, () => setNotice({ tone: 'error', text: 'Some prices need attention: see the marked boxes.' }))} noValidate className="flex max-w-3xl flex-col gap-6">
      <div aria-live="polite">{notice ? <Alert tone={notice.tone}>{notice.text}</Alert> : null}</div>

      <fieldset className="grid grid-cols-1 gap-3 rounded-xl border border-line bg-card p-3 shadow-sm sm:grid-cols-2">
        <legend className="px-1 font-bold">Tax and terms</legend>
        <Field id="taxLabel" label="Tax name" error={e.taxLabel?.message} hint="Shown on invoices, e.g. VAT or Sales tax.">
          <Input {...register('taxLabel')} {...errorProps('taxLabel', e.taxLabel)} />
        </Field>
        <Field id="taxRateBp" label="Tax rate (%)" error={e.taxRateBp?.message} hint="Charged once on each invoice’s subtotal.">
          <Controller
            control={control}
            name="taxRateBp"
            render={({ field }) => (
              <ParsedInput {...errorProps('taxRateBp', e.taxRateBp)} name={field.name} onBlur={field.onBlur} value={field.value} onChange={field.onChange} parse={parseRatePct} format={formatRatePct} />
            )}
          />
        </Field>
        <Field id="paymentTermsDays" label="Days to pay" error={e.paymentTermsDays?.message}>
          <Input type="number" inputMode="numeric" min={0} max={120} {...register('paymentTermsDays', { valueAsNumber: true })} {...errorProps('paymentTermsDays', e.paymentTermsDays)} />
        </Field>
        <Field id="invoicePrefix" label="Invoice number prefix" error={e.invoicePrefix?.message} hint="Numbers read like KHS-000042.">
          <Input {...register('invoicePrefix')} {...errorProps('invoicePrefix', e.invoicePrefix)} />
        </Field>
      </fieldset>

      <fieldset className="rounded-xl border border-line bg-card p-3 shadow-sm">
        <legend className="px-1 font-bold">Visit types</legend>
        <ul>
          {section('visit').map(({ f, index }) => (
            <PriceRow key={f.key} index={index} item={f} control={control} errors={e} currency={currency} />
          ))}
        </ul>
      </fieldset>

      <fieldset className="rounded-xl border border-line bg-card p-3 shadow-sm">
        <legend className="px-1 font-bold">Per appliance tested</legend>
        <p className="text-sm text-ink-soft">Charged once for each appliance at the property. “Any other appliance” covers categories without their own price.</p>
        <ul>
          {section('appliance').map(({ f, index }) => (
            <PriceRow key={f.key} index={index} item={f} control={control} errors={e} currency={currency} onRemove={() => remove(index)} />
          ))}
        </ul>
        {openCategories.length > 0 ? (
          <div className="mt-2 flex flex-wrap items-end gap-2 border-t border-line pt-3">
            <Field id="new-category" label="Add a price for">
              <Select id="new-category" value={newCategory} onChange={(ev) => setNewCategory(ev.target.value)} placeholder="Choose a category" options={openCategories.map((c) => ({ value: c, label: appliancePriceLabel(c) }))} />
            </Field>
            <Button
              type="button"
              variant="secondary"
              disabled={!newCategory}
              onClick={() => {
                append({ id: null, kind: 'appliance', code: newCategory, name: `${appliancePriceLabel(newCategory as AppliancePriceCode)} test`, unitAmountMinor: Number.NaN, active: true });
                setNewCategory('');
              }}
            >
              Add
            </Button>
          </div>
        ) : null}
      </fieldset>

      <fieldset className="rounded-xl border border-line bg-card p-3 shadow-sm">
        <legend className="px-1 font-bold">Extras</legend>
        <p className="text-sm text-ink-soft">Parts and work the office can add to an invoice, such as an alarm fitted.</p>
        <ul>
          {section('extra').map(({ f, index }) => (
            <PriceRow key={f.key} index={index} item={f} control={control} errors={e} currency={currency} onRemove={() => remove(index)} />
          ))}
        </ul>
        <div className="mt-2 border-t border-line pt-3">
          <Button type="button" variant="secondary" onClick={() => append({ id: null, kind: 'extra', code: null, name: '', unitAmountMinor: Number.NaN, active: true })}>
            Add an extra
          </Button>
        </div>
      </fieldset>

      <div className="sticky bottom-0 -mx-3 border-t border-line bg-paper/95 px-3 py-3">
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Saving…' : 'Save prices'}
        </Button>
      </div>
    </form>
  );
}
