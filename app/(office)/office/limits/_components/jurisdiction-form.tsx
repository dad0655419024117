'use client';
// Adds a jurisdiction under a parent; validated by the same schema as POST /api/v1/jurisdictions.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { jurisdictionSchema, JURISDICTION_LEVELS, type JurisdictionData, type JurisdictionInput } from '@/lib/validations/limits';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['name', 'level', 'parentId', 'certificatePeriodMonths', 'earlyRenewalDays', 'renewalRuleSource'] as const;

export function JurisdictionForm({ parents }: { parents: Array<{ id: string; name: string; depth: number }> }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState, reset } = useForm<JurisdictionInput, unknown, JurisdictionData>({
    resolver: zodResolver(jurisdictionSchema),
    defaultValues: { name: '', level: 'local', parentId: parents[0]?.id ?? '', certificatePeriodMonths: 12, earlyRenewalDays: 60, renewalRuleSource: '' },
  });
  const e = formState.errors;

  async function onSubmit(data: JurisdictionData) {
    setFailure('');
    try {
      const body = await fetchJson<{ jurisdiction: { id: string } }>('/api/v1/jurisdictions', { method: 'POST', body: JSON.stringify(data) });
      reset();
      router.push(`/office/limits/${body.jurisdiction.id}`);
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid gap-3 sm:grid-cols-2" aria-label="Add a jurisdiction">
      {failure ? <div className="sm:col-span-2"><Alert tone="error">{failure}</Alert></div> : null}
      <Field id="j-name" label="Name" error={e.name?.message}>
        <Input {...register('name')} {...errorProps('j-name', e.name)} />
      </Field>
      <Field id="j-parent" label="Part of" error={e.parentId?.message}>
        <Select
          {...register('parentId')}
          {...errorProps('j-parent', e.parentId)}
          placeholder="Nothing (a new top level)"
          options={parents.map((p) => ({ value: p.id, label: `${'— '.repeat(p.depth)}${p.name}` }))}
        />
      </Field>
      <Field id="j-level" label="Level" error={e.level?.message}>
        <Select {...register('level')} {...errorProps('j-level', e.level)} options={JURISDICTION_LEVELS.map((l) => ({ value: l, label: l.charAt(0).toUpperCase() + l.slice(1) }))} />
      </Field>
      <Field id="j-period" label="Certificate period (months)" error={e.certificatePeriodMonths?.message}>
        <Input type="number" inputMode="numeric" {...register('certificatePeriodMonths')} {...errorProps('j-period', e.certificatePeriodMonths)} />
      </Field>
      <Field id="j-early" label="Early renewal window (days)" error={e.earlyRenewalDays?.message}>
        <Input type="number" inputMode="numeric" {...register('earlyRenewalDays')} {...errorProps('j-early', e.earlyRenewalDays)} />
      </Field>
      <Field id="j-source" label="Renewal rule source (optional)" error={e.renewalRuleSource?.message}>
        <Input {...register('renewalRuleSource')} {...errorProps('j-source', e.renewalRuleSource)} />
      </Field>
      <div className="sm:col-span-2">
        <Button type="submit" disabled={formState.isSubmitting}>Add jurisdiction</Button>
      </div>
    </form>
  );
}
