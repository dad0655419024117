'use client';
// Book or re-book a visit; validated by the same schema as /api/v1/visits. Clashes come back as
// warnings: the booking is kept and the office sees what to sort out.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { VISIT_KINDS, VISIT_KIND_LABELS, visitSchema, type VisitData, type VisitInput } from '@/lib/validations/visits';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, TextArea, applyServerErrors, errorProps } from '../../_components/form-bits';
import type { ClashWarning } from '@/db/schedule';

const FIELDS = ['siteId', 'engineerId', 'kind', 'date', 'startTime', 'endTime', 'notes'] as const;

export function VisitForm({ id, initial, sites, engineers }: { id?: string; initial: VisitInput; sites: Array<{ id: string; label: string }>; engineers: Array<{ id: string; name: string }> }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const [warnings, setWarnings] = useState<ClashWarning[]>([]);
  const { register, handleSubmit, setError, formState } = useForm<VisitInput, unknown, VisitData>({ resolver: zodResolver(visitSchema), defaultValues: initial });
  const e = formState.errors;

  async function onSubmit(data: VisitData) {
    setFailure('');
    try {
      const result = await fetchJson<{ warnings: ClashWarning[] }>(id ? `/api/v1/visits/${id}` : '/api/v1/visits', { method: id ? 'PATCH' : 'POST', body: JSON.stringify(data) });
      if (result.warnings.length) {
        setWarnings(result.warnings);
        router.refresh();
        return;
      }
      router.push('/office/board');
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid max-w-2xl gap-4 sm:grid-cols-2">
      {failure ? <div className="sm:col-span-2"><Alert tone="error">{failure}</Alert></div> : null}
      {warnings.length ? (
        <div className="sm:col-span-2">
          <Alert tone="warning" title="Saved, but it clashes">
            <ul className="ml-4 list-disc">{warnings.map((w) => <li key={w.visitId + w.kind}>{w.message}</li>)}</ul>
            <a className="font-semibold underline" href="/office/board">Back to the board</a>
          </Alert>
        </div>
      ) : null}
      <div className="sm:col-span-2">
        <Field id="siteId" label="Site" error={e.siteId?.message}>
          <Select {...register('siteId')} {...errorProps('siteId', e.siteId)} placeholder="Choose a site…" options={sites.map((s) => ({ value: s.id, label: s.label }))} />
        </Field>
      </div>
      <Field id="engineerId" label="Engineer" error={e.engineerId?.message}>
        <Select {...register('engineerId')} {...errorProps('engineerId', e.engineerId)} placeholder="Unassigned" options={engineers.map((x) => ({ value: x.id, label: x.name }))} />
      </Field>
      <Field id="kind" label="Kind of visit" error={e.kind?.message}>
        <Select {...register('kind')} {...errorProps('kind', e.kind)} options={VISIT_KINDS.map((k) => ({ value: k, label: VISIT_KIND_LABELS[k] }))} />
      </Field>
      <Field id="date" label="Date" error={e.date?.message}>
        <Input type="date" {...register('date')} {...errorProps('date', e.date)} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="startTime" label="From" error={e.startTime?.message}>
          <Input type="time" step={900} {...register('startTime')} {...errorProps('startTime', e.startTime)} />
        </Field>
        <Field id="endTime" label="To" error={e.endTime?.message}>
          <Input type="time" step={900} {...register('endTime')} {...errorProps('endTime', e.endTime)} />
        </Field>
      </div>
      <div className="sm:col-span-2">
        <Field id="notes" label="Notes for the engineer (optional)" error={e.notes?.message}>
          <TextArea {...register('notes')} {...errorProps('notes', e.notes)} />
        </Field>
      </div>
      <div className="sm:col-span-2">
        <Button type="submit" disabled={formState.isSubmitting}>{id ? 'Save booking' : 'Book visit'}</Button>
      </div>
    </form>
  );
}
