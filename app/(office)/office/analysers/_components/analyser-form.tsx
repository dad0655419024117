'use client';
// Add or change an analyser; same schema as /api/v1/analysers.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { analyserSchema, type AnalyserData, type AnalyserInput } from '@/lib/validations/analysers';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['serial', 'make', 'model', 'calibratedOn', 'calibrationDue', 'coRangeMaxPpm', 'assignedTo'] as const;

export function AnalyserForm({ id, initial, engineers }: { id?: string; initial: AnalyserInput; engineers: Array<{ id: string; name: string }> }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState } = useForm<AnalyserInput, unknown, AnalyserData>({ resolver: zodResolver(analyserSchema), defaultValues: initial });
  const e = formState.errors;

  async function onSubmit(data: AnalyserData) {
    setFailure('');
    try {
      await fetchJson(id ? `/api/v1/analysers/${id}` : '/api/v1/analysers', { method: id ? 'PATCH' : 'POST', body: JSON.stringify(data) });
      router.push('/office/analysers');
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  const text = (name: (typeof FIELDS)[number], label: string, type = 'text') => (
    <Field id={name} label={label} error={e[name]?.message}>
      <Input type={type} {...register(name)} {...errorProps(name, e[name])} />
    </Field>
  );

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid max-w-2xl gap-4 sm:grid-cols-2">
      {failure ? <div className="sm:col-span-2"><Alert tone="error">{failure}</Alert></div> : null}
      {text('serial', 'Serial')}
      {text('make', 'Make')}
      {text('model', 'Model')}
      {text('coRangeMaxPpm', 'CO range, ppm (upper limit)')}
      {text('calibratedOn', 'Calibrated on', 'date')}
      {text('calibrationDue', 'Calibration due', 'date')}
      <Field id="assignedTo" label="Held by" error={e.assignedTo?.message}>
        <Select {...register('assignedTo')} {...errorProps('assignedTo', e.assignedTo)} placeholder="In the office" options={engineers.map((x) => ({ value: x.id, label: x.name }))} />
      </Field>
      <div className="sm:col-span-2"><Button type="submit" disabled={formState.isSubmitting}>{id ? 'Save analyser' : 'Add analyser'}</Button></div>
    </form>
  );
}
