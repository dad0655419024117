'use client';
// Add or change an appliance at a site; same schema as /api/v1/appliances.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { applianceSchema, FLUE_TYPES, FLUE_TYPE_LABELS, type ApplianceData, type ApplianceInput } from '@/lib/validations/appliances';
import { APPLIANCE_CATEGORIES, APPLIANCE_CATEGORY_LABELS, FUEL_IDS, FUEL_LABELS } from '@/lib/limits/types';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['siteId', 'category', 'fuel', 'flueType', 'location', 'make', 'model', 'serial', 'ratedInputKw', 'mfrRatioMax', 'mfrCoAirFreeMaxPpm', 'mfrCoMaxPpm'] as const;

export function ApplianceForm({ id, initial }: { id?: string; initial: ApplianceInput }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState } = useForm<ApplianceInput, unknown, ApplianceData>({ resolver: zodResolver(applianceSchema), defaultValues: initial });
  const e = formState.errors;

  async function onSubmit(data: ApplianceData) {
    setFailure('');
    try {
      await fetchJson(id ? `/api/v1/appliances/${id}` : '/api/v1/appliances', { method: id ? 'PATCH' : 'POST', body: JSON.stringify(data) });
      router.push(`/office/sites/${data.siteId}`);
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  async function retire() {
    if (!id) return;
    await fetchJson(`/api/v1/appliances/${id}`, { method: 'DELETE' });
    router.push(`/office/sites/${initial.siteId}`);
    router.refresh();
  }

  const text = (name: (typeof FIELDS)[number], label: string, hint?: string) => (
    <Field id={name} label={label} error={e[name]?.message} hint={hint}>
      <Input {...register(name)} {...errorProps(name, e[name])} inputMode={name.startsWith('mfr') || name === 'ratedInputKw' ? 'decimal' : undefined} />
    </Field>
  );

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid max-w-2xl gap-4 sm:grid-cols-2">
      {failure ? <div className="sm:col-span-2"><Alert tone="error">{failure}</Alert></div> : null}
      <input type="hidden" {...register('siteId')} />
      <Field id="category" label="Category" error={e.category?.message}>
        <Select {...register('category')} {...errorProps('category', e.category)} options={APPLIANCE_CATEGORIES.map((c) => ({ value: c, label: APPLIANCE_CATEGORY_LABELS[c] }))} />
      </Field>
      <Field id="fuel" label="Fuel" error={e.fuel?.message}>
        <Select {...register('fuel')} {...errorProps('fuel', e.fuel)} options={FUEL_IDS.map((f) => ({ value: f, label: FUEL_LABELS[f] }))} />
      </Field>
      <Field id="flueType" label="Flue arrangement" error={e.flueType?.message}>
        <Select {...register('flueType')} {...errorProps('flueType', e.flueType)} options={FLUE_TYPES.map((f) => ({ value: f, label: FLUE_TYPE_LABELS[f] }))} />
      </Field>
      {text('location', 'Location in the property')}
      {text('make', 'Make (optional)')}
      {text('model', 'Model (optional)')}
      {text('serial', 'Serial (optional)')}
      {text('ratedInputKw', 'Rated heat input, kW (optional)')}
      {text('mfrRatioMax', 'Manufacturer CO/CO2 ratio limit (optional)', 'e.g. 0.004 — applies where stricter than the code profile')}
      {text('mfrCoMaxPpm', 'Manufacturer CO limit, ppm (optional)')}
      {text('mfrCoAirFreeMaxPpm', 'Manufacturer air-free CO limit, ppm (optional)')}
      <div className="flex gap-2 sm:col-span-2">
        <Button type="submit" disabled={formState.isSubmitting}>{id ? 'Save appliance' : 'Add appliance'}</Button>
        {id ? <Button type="button" variant="ghost" onClick={retire}>Retire appliance</Button> : null}
      </div>
    </form>
  );
}
