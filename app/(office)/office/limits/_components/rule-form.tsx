'use client';
// Add or change one limit rule. Validated by the same schema as the rules API, whose rule checks come
// from lib/limits (danger above service, positive figures, a ratio below 1, a source named). Saving
// writes a new profile version taking effect on the chosen date; earlier versions stay as they were.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { ruleChangeSchema, type RuleChangeData, type RuleChangeInput } from '@/lib/validations/limits';
import {
  APPLIANCE_CATEGORIES,
  APPLIANCE_CATEGORY_LABELS,
  FUEL_IDS,
  FUEL_LABELS,
  METRICS,
  METRIC_LABELS,
  METRIC_UNITS,
  TEST_POINTS,
  TEST_POINT_LABELS,
  type LimitRule,
} from '@/lib/limits';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { Select, TextArea, applyServerErrors, errorProps } from '../../_components/form-bits';

const FIELDS = ['metric', 'scope.category', 'scope.fuel', 'scope.testPoint', 'comparator', 'serviceAt', 'dangerAt', 'source', 'note', 'effectiveFrom', 'summary'] as const;

function initialValues(rule: LimitRule | null, today: string): RuleChangeInput {
  return {
    metric: rule?.metric ?? 'co_co2_ratio',
    scope: { category: rule?.scope.category ?? '', fuel: rule?.scope.fuel ?? '', testPoint: rule?.scope.testPoint ?? '' },
    comparator: rule?.comparator ?? 'gt',
    serviceAt: rule?.serviceAt === null || rule?.serviceAt === undefined ? '' : String(rule.serviceAt),
    dangerAt: rule?.dangerAt === null || rule?.dangerAt === undefined ? '' : String(rule.dangerAt),
    source: rule?.source ?? '',
    note: rule?.note ?? '',
    effectiveFrom: today,
    summary: '',
  };
}

export function RuleForm({ ownerId, rule, ruleKey, today, onDone }: { ownerId: string; rule: LimitRule | null; ruleKey: string | null; today: string; onDone: () => void }) {
  const router = useRouter();
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState, control } = useForm<RuleChangeInput, unknown, RuleChangeData>({
    resolver: zodResolver(ruleChangeSchema),
    defaultValues: initialValues(rule, today),
  });
  const e = formState.errors;
  const metric = useWatch({ control, name: 'metric' }) as (typeof METRICS)[number];
  const unit = METRIC_UNITS[metric] ?? '';

  async function onSubmit(data: RuleChangeData) {
    setFailure('');
    try {
      const base = `/api/v1/jurisdictions/${ownerId}/profile/rules`;
      await fetchJson(ruleKey ? `${base}/${ruleKey}` : base, { method: ruleKey ? 'PATCH' : 'POST', body: JSON.stringify(data) });
      onDone();
      router.refresh();
    } catch (err) {
      setFailure(applyServerErrors(err, setError, FIELDS));
    }
  }

  const prefix = ruleKey ? `edit-${ruleKey.slice(0, 8)}` : 'new-rule';
  const id = (name: string) => `${prefix}-${name}`;

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid gap-3 rounded-xl border border-copper/40 bg-white p-4 sm:grid-cols-2" aria-label={ruleKey ? 'Change rule' : 'Add a rule'}>
      <h3 className="text-lg font-bold sm:col-span-2">{ruleKey ? 'Change rule' : 'Add a rule'}</h3>
      {failure ? <div className="sm:col-span-2"><Alert tone="error">{failure}</Alert></div> : null}
      <Field id={id('metric')} label="Metric" error={e.metric?.message}>
        <Select {...register('metric')} {...errorProps(id('metric'), e.metric)} options={METRICS.map((m) => ({ value: m, label: METRIC_LABELS[m] }))} />
      </Field>
      <Field id={id('comparator')} label="Trips when the value is" error={e.comparator?.message}>
        <Select {...register('comparator')} {...errorProps(id('comparator'), e.comparator)} options={[{ value: 'gt', label: 'above the threshold' }, { value: 'gte', label: 'at or above the threshold' }]} />
      </Field>
      <Field id={id('category')} label="Appliance category" error={e.scope?.category?.message}>
        <Select {...register('scope.category')} {...errorProps(id('category'), e.scope?.category)} placeholder="Any" options={APPLIANCE_CATEGORIES.map((c) => ({ value: c, label: APPLIANCE_CATEGORY_LABELS[c] }))} />
      </Field>
      <Field id={id('fuel')} label="Fuel" error={e.scope?.fuel?.message}>
        <Select {...register('scope.fuel')} {...errorProps(id('fuel'), e.scope?.fuel)} placeholder="Any" options={FUEL_IDS.map((f) => ({ value: f, label: FUEL_LABELS[f] }))} />
      </Field>
      <Field id={id('testPoint')} label="Test point" error={e.scope?.testPoint?.message}>
        <Select {...register('scope.testPoint')} {...errorProps(id('testPoint'), e.scope?.testPoint)} placeholder="Any" options={TEST_POINTS.map((t) => ({ value: t, label: TEST_POINT_LABELS[t] }))} />
      </Field>
      <div className="hidden sm:block" />
      <Field id={id('serviceAt')} label={`Service level${unit ? ` (${unit})` : ''}`} error={e.serviceAt?.message} hint={metric === 'co_co2_ratio' ? 'A ratio, e.g. 0.008 (not a percentage).' : metric === 'spillage' ? 'Use 1 with “at or above”: a failed test is 1.' : undefined}>
        <Input inputMode="decimal" {...register('serviceAt')} {...errorProps(id('serviceAt'), e.serviceAt)} />
      </Field>
      <Field id={id('dangerAt')} label={`Danger level${unit ? ` (${unit})` : ''} (optional)`} error={e.dangerAt?.message}>
        <Input inputMode="decimal" {...register('dangerAt')} {...errorProps(id('dangerAt'), e.dangerAt)} />
      </Field>
      <div className="sm:col-span-2">
        <Field id={id('source')} label="Source" error={e.source?.message} hint="The published source of the figure, or “Configured policy of …” for your own.">
          <Input {...register('source')} {...errorProps(id('source'), e.source)} />
        </Field>
      </div>
      <div className="sm:col-span-2">
        <Field id={id('note')} label="Note (optional)" error={e.note?.message}>
          <TextArea rows={2} {...register('note')} {...errorProps(id('note'), e.note)} />
        </Field>
      </div>
      <Field id={id('effectiveFrom')} label="Takes effect on" error={e.effectiveFrom?.message} hint="Today or later. Earlier dates keep the current limits.">
        <Input type="date" min={today} {...register('effectiveFrom')} {...errorProps(id('effectiveFrom'), e.effectiveFrom)} />
      </Field>
      <Field id={id('summary')} label="What changed (optional)" error={e.summary?.message}>
        <Input {...register('summary')} {...errorProps(id('summary'), e.summary)} />
      </Field>
      <div className="flex flex-wrap gap-2 sm:col-span-2">
        <Button type="submit" disabled={formState.isSubmitting}>{ruleKey ? 'Save as new version' : 'Add rule as new version'}</Button>
        <Button type="button" variant="secondary" onClick={onDone}>Cancel</Button>
      </div>
    </form>
  );
}
