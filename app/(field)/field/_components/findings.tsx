'use client';
// Defects and hazards found, each with how serious it is and what was done about it.
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { newId } from '@/lib/ids';
import { FINDING_ACTION_LABELS, FINDING_ACTIONS, FINDING_SEVERITIES, FINDING_SEVERITY_LABELS, findingSchema } from '@/lib/validations/inspection';
import { FINDING_LEVEL } from '@/lib/field';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { Button } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';
import { PhotoStrip } from './photos';
import { makeMutation, type VisitContext } from './use-field';

type Input = z.input<typeof findingSchema>;
type Output = z.output<typeof findingSchema>;

function FindingForm({ ctx, applianceId, subject, onDone }: { ctx: VisitContext; applianceId: string | null; subject: string; onDone: () => void }) {
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(findingSchema),
    defaultValues: { findingId: newId(), applianceId, severity: 'service', description: '', action: 'advice_given', recordedAt: new Date().toISOString() },
  });
  const { register, handleSubmit, formState, watch, setValue } = form;
  const severity = watch('severity');
  const prefix = `finding-${applianceId ?? 'installation'}`;
  const save = handleSubmit(async (data) => {
    await ctx.field.commit(makeMutation('finding.save', ctx.record.visitId, { ...data, recordedAt: new Date().toISOString() }), `Finding (${FINDING_SEVERITY_LABELS[data.severity].toLowerCase()}) — ${subject}`);
    onDone();
  });
  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-2 rounded-lg border border-copper bg-white p-2" aria-label={`New finding: ${subject}`}>
      <div role="group" aria-label="How serious" className="grid grid-cols-3 gap-1">
        {FINDING_SEVERITIES.map((s) => (
          <button
            key={s}
            type="button"
            aria-pressed={severity === s}
            onClick={() => {
              setValue('severity', s);
              if (s === 'danger') setValue('action', 'turned_off');
            }}
            className={`min-h-11 rounded-lg border text-sm font-semibold ${severity === s ? (s === 'danger' ? 'border-danger bg-danger text-white' : s === 'service' ? 'border-service bg-service text-white' : 'border-ink bg-ink text-paper') : 'border-line bg-white'}`}
          >
            {FINDING_SEVERITY_LABELS[s]}
          </button>
        ))}
      </div>
      <Field id={`${prefix}-description`} label="What was found" error={formState.errors.description?.message}>
        <textarea id={`${prefix}-description`} rows={3} className={inputClass} {...register('description')} aria-invalid={formState.errors.description ? true : undefined} />
      </Field>
      <Field id={`${prefix}-action`} label="Action taken" error={formState.errors.action?.message}>
        <select id={`${prefix}-action`} className={inputClass} {...register('action')}>
          {FINDING_ACTIONS.map((a) => (
            <option key={a} value={a}>
              {FINDING_ACTION_LABELS[a]}
            </option>
          ))}
        </select>
      </Field>
      <div className="flex gap-2">
        <Button type="submit" className="flex-1">
          Save finding
        </Button>
        <Button type="button" variant="secondary" onClick={onDone} className="flex-1">
          Cancel
        </Button>
      </div>
    </form>
  );
}

export function Findings({ ctx, applianceId, subject }: { ctx: VisitContext; applianceId: string | null; subject: string }) {
  const [adding, setAdding] = useState(false);
  const findings = ctx.record.findings.filter((f) => f.applianceId === applianceId);
  return (
    <section aria-labelledby={`findings-${applianceId ?? 'installation'}`} className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
      <h3 id={`findings-${applianceId ?? 'installation'}`} className="text-base font-bold">
        Findings
      </h3>
      {findings.length === 0 && !adding ? <p className="text-sm text-ink-soft">None recorded.</p> : null}
      <ul className="flex flex-col gap-2">
        {findings.map((f) => (
          <li key={f.findingId} className="flex flex-col gap-2 rounded-lg bg-paper p-2 text-sm" data-testid="finding">
            <div className="flex items-center justify-between gap-2">
              <VerdictBadge level={FINDING_LEVEL[f.severity]} label={FINDING_SEVERITY_LABELS[f.severity]} size="sm" />
              <span className="text-xs font-semibold">{FINDING_ACTION_LABELS[f.action]}</span>
            </div>
            <p>{f.description}</p>
            <PhotoStrip ctx={ctx} target={{ purpose: 'finding', applianceId, findingId: f.findingId }} label={`finding: ${f.description.slice(0, 40)}`} />
            {!ctx.closed ? (
              <button
                type="button"
                onClick={() => void ctx.field.commit(makeMutation('finding.remove', ctx.record.visitId, { findingId: f.findingId }), `Finding removed — ${subject}`)}
                className="min-h-11 self-start text-sm font-semibold text-ink-soft underline"
              >
                Remove finding
              </button>
            ) : null}
          </li>
        ))}
      </ul>
      {adding ? <FindingForm ctx={ctx} applianceId={applianceId} subject={subject} onDone={() => setAdding(false)} /> : null}
      {!adding && !ctx.closed ? (
        <Button variant="secondary" onClick={() => setAdding(true)}>
          Add a finding
        </Button>
      ) : null}
    </section>
  );
}
