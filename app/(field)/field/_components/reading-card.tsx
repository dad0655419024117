'use client';
// One analyser reading at one test point. The derived figures and the verdict, with its
// explanation, follow the numbers as they are typed (lib/combustion and lib/limits, the same code
// the server runs); what is typed is kept on the phone as a draft until it is recorded.
import { useEffect, useMemo, useRef, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { cToF, fToC } from '@/lib/combustion';
import { TEST_POINT_LABELS, type TestPoint } from '@/lib/limits';
import { newId } from '@/lib/ids';
import { readingRecordSchema, readingValuesSchema, type ApplianceDetails } from '@/lib/validations/inspection';
import { analyseReading, applianceVerdict, canonicalReading, currentReadings, formatFixed, formatRatio, tempForInput, type RecordedReading } from '@/lib/field';
import { deleteDraft, getDraft, saveDraft } from '@/lib/sync/store';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { Button } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';
import { VerdictItems } from './verdict-list';
import { makeMutation, type VisitContext } from './use-field';

type FormInput = z.input<typeof readingRecordSchema>;
type FormOutput = z.output<typeof readingRecordSchema>;
type ValueKey = 'coPpm' | 'co2Pct' | 'o2Pct' | 'flueTemp' | 'airTemp';

const TEST_POINT_HINTS: Record<TestPoint, string> = {
  high_fire: 'Appliance at full rate, after it has settled.',
  low_fire: 'Appliance at its lowest firing rate.',
  as_left: 'As you leave it, after any adjustment.',
};

function valuesFrom(reading: RecordedReading | null, unit: 'C' | 'F'): FormInput['values'] {
  if (!reading) return { coPpm: '', co2Pct: '', o2Pct: '', flueTemp: '', airTemp: '', tempUnit: unit };
  const text = (v: number | null) => (v === null ? '' : String(v));
  return { coPpm: text(reading.coPpm), co2Pct: text(reading.co2Pct), o2Pct: text(reading.o2Pct), flueTemp: tempForInput(reading.flueTempC, unit), airTemp: tempForInput(reading.airTempC, unit), tempUnit: unit };
}

function sameAsRecorded(values: FormInput['values'], reading: RecordedReading | null): boolean {
  if (!reading) return false;
  const parsed = readingValuesSchema.safeParse(values);
  if (!parsed.success) return false;
  const c = canonicalReading(parsed.data);
  const close = (a: number | null, b: number | null) => (a === null || b === null ? a === b : Math.abs(a - b) < 0.05);
  return close(c.coPpm, reading.coPpm) && close(c.co2Pct, reading.co2Pct) && close(c.o2Pct, reading.o2Pct) && close(c.flueTempC, reading.flueTempC) && close(c.airTempC, reading.airTempC);
}

export function ReadingCard({ ctx, applianceId, testPoint, details }: { ctx: VisitContext; applianceId: string; testPoint: TestPoint; details: ApplianceDetails }) {
  const { field } = ctx;
  const inspection = ctx.inspectionOf(applianceId);
  const recorded = currentReadings(inspection.readings).filter((r) => r.testPoint === testPoint);
  const latest = recorded.at(-1) ?? null;
  const unit = field.prefs.tempUnit;
  const draftKey = `${ctx.record.visitId}:${applianceId}:${testPoint}`;
  const [restored, setRestored] = useState(false);
  const [saving, setSaving] = useState(false);
  const [saveError, setSaveError] = useState<string | null>(null);
  const idPrefix = `${applianceId}-${testPoint}`;

  const form = useForm<FormInput, unknown, FormOutput>({
    resolver: zodResolver(readingRecordSchema),
    defaultValues: { readingId: newId(), applianceId, testPoint, values: valuesFrom(latest, unit), analyserId: inspection.analyserId, takenAt: new Date().toISOString(), replacesId: latest?.id ?? null },
  });
  const { register, control, setValue, handleSubmit, formState, getValues } = form;
  const values = useWatch({ control, name: 'values' });

  // A draft left from before (the app closed, the phone died) comes back exactly as typed.
  useEffect(() => {
    if (!field.db || restored) return;
    void getDraft(field.db, draftKey).then((draft) => {
      if (draft) setValue('values', draft.values as FormInput['values']);
      setRestored(true);
    });
  }, [field.db, draftKey, restored, setValue]);

  const lastSaved = useRef<string>('');
  useEffect(() => {
    if (!field.db || !restored || ctx.closed) return;
    const json = JSON.stringify(values);
    if (json === lastSaved.current) return;
    const timer = window.setTimeout(() => {
      lastSaved.current = json;
      const untouched = sameAsRecorded(values, latest) || (!latest && Object.entries(values).every(([k, v]) => k === 'tempUnit' || v === '' || v === null || v === undefined));
      void (untouched ? deleteDraft(field.db!, draftKey) : saveDraft(field.db!, draftKey, values as Record<string, unknown>));
    }, 300);
    return () => window.clearTimeout(timer);
  }, [values, field.db, restored, draftKey, latest, ctx.closed]);

  // Switching °C/°F converts what is already typed rather than reinterpreting it.
  useEffect(() => {
    const current = getValues('values');
    if (current.tempUnit === unit) return;
    const convert = (raw: unknown) => {
      const n = typeof raw === 'string' ? Number(raw.replace(',', '.')) : typeof raw === 'number' ? raw : NaN;
      if (raw === '' || raw === null || raw === undefined || !Number.isFinite(n)) return raw;
      try {
        return String(Number((unit === 'F' ? cToF(n) : fToC(n)).toFixed(1)));
      } catch {
        return raw;
      }
    };
    setValue('values', { ...current, flueTemp: convert(current.flueTemp) as string, airTemp: convert(current.airTemp) as string, tempUnit: unit });
  }, [unit, getValues, setValue]);

  type Live = { problems: Partial<Record<ValueKey, string>>; analysis: ReturnType<typeof analyseReading>['analysis']; verdict: ReturnType<typeof applianceVerdict>['verdict'] | null; error: string | null };
  const live = useMemo((): Live => {
    const parsed = readingValuesSchema.safeParse(values);
    if (!parsed.success) {
      const problems: Partial<Record<ValueKey, string>> = {};
      for (const issue of parsed.error.issues) {
        const key = issue.path[0] as ValueKey;
        const raw = values?.[key];
        // Say nothing about a box not filled in yet; "required" shows when recording.
        if (raw !== '' && raw !== null && raw !== undefined && !problems[key]) problems[key] = issue.message;
      }
      return { problems, analysis: null, verdict: null, error: null };
    }
    const reading = canonicalReading(parsed.data);
    const result = analyseReading(reading, details.fuel);
    if (result.error) return { problems: {}, analysis: null, verdict: null, error: result.error.message };
    const draft: RecordedReading = { id: 'draft', testPoint, ...reading, analyserId: inspection.analyserId, takenAt: new Date().toISOString(), replacesId: null };
    const verdict = applianceVerdict({ details, readings: [draft], spillage: null, limits: ctx.limits, date: ctx.date }).verdict;
    return { problems: {}, analysis: result.analysis, verdict, error: null };
  }, [values, details, testPoint, inspection.analyserId, ctx.limits, ctx.date]);

  const analyser = field.bundle?.analysers.find((a) => a.id === inspection.analyserId) ?? null;
  const coOverRange = analyser && live.analysis && live.analysis.coPpm > analyser.coRangeMaxPpm;
  const unchanged = sameAsRecorded(values, latest);
  const entry = latest ? ctx.entries.find((e) => e.type === 'mutation' && e.mutation.kind === 'reading.record' && e.mutation.payload.readingId === latest.id) : undefined;

  const onRecord = handleSubmit(async (data) => {
    setSaving(true);
    setSaveError(null);
    try {
      const payload = { ...data, readingId: newId(), analyserId: inspection.analyserId, takenAt: new Date().toISOString(), replacesId: latest?.id ?? null };
      await field.commit(makeMutation('reading.record', ctx.record.visitId, payload), `Reading, ${TEST_POINT_LABELS[testPoint]} — ${details.location}`);
      if (field.db) await deleteDraft(field.db, draftKey);
    } catch (err) {
      setSaveError(err instanceof Error ? err.message : 'The reading could not be saved on this phone.');
    } finally {
      setSaving(false);
    }
  });

  const fieldError = (key: ValueKey) => live.problems[key] ?? formState.errors.values?.[key]?.message;
  const box = (key: ValueKey, label: string, unitText: string) => {
    const err = fieldError(key);
    const id = `${idPrefix}-${key}`;
    return (
      <div className="flex flex-col gap-1">
        <label htmlFor={id} className="text-sm font-semibold">
          {label} <span className="font-normal text-ink-soft">{unitText}</span>
        </label>
        <input
          id={id}
          inputMode="decimal"
          autoComplete="off"
          enterKeyHint="next"
          disabled={ctx.closed}
          aria-invalid={err ? true : undefined}
          aria-describedby={err ? `${id}-error` : undefined}
          className={`${inputClass} tabular text-lg`}
          {...register(`values.${key}`)}
        />
        {err ? (
          <p id={`${id}-error`} className="text-xs font-semibold text-danger">
            {err}
          </p>
        ) : null}
      </div>
    );
  };

  const figures: Array<[string, string]> = live.analysis
    ? [
        ['CO/CO2 ratio', formatRatio(live.analysis.ratio)],
        ['Air-free CO (O2)', live.analysis.coAirFreeFromO2Ppm === null ? '—' : `${formatFixed(live.analysis.coAirFreeFromO2Ppm, 0)} ppm`],
        ['Air-free CO (CO2)', live.analysis.coAirFreeFromCo2Ppm === null ? '—' : `${formatFixed(live.analysis.coAirFreeFromCo2Ppm, 0)} ppm`],
        ['CO2 from O2', live.analysis.co2FromO2Pct === null ? '—' : `${formatFixed(live.analysis.co2FromO2Pct, 2)} %`],
        ['Excess air', live.analysis.excessAirPct === null ? '—' : `${formatFixed(live.analysis.excessAirPct, 1)} %`],
        ['Lambda', formatFixed(live.analysis.lambda, 3)],
        ['Flue loss', live.analysis.flueLossPct === null ? '—' : `${formatFixed(live.analysis.flueLossPct, 1)} %`],
        ['Net efficiency', live.analysis.netEfficiencyPct === null ? '—' : `${formatFixed(live.analysis.netEfficiencyPct, 1)} %`],
      ]
    : [];

  return (
    <section aria-labelledby={`${idPrefix}-title`} className="flex flex-col gap-3 rounded-xl border border-line bg-card p-3" data-testid={`reading-${testPoint}`}>
      <div className="flex items-start justify-between gap-2">
        <div>
          <h3 id={`${idPrefix}-title`} className="text-base font-bold capitalize">
            {TEST_POINT_LABELS[testPoint]}
          </h3>
          <p className="text-xs text-ink-soft">{TEST_POINT_HINTS[testPoint]}</p>
        </div>
        {live.verdict ? <VerdictBadge level={live.verdict.overall} /> : null}
      </div>
      <form onSubmit={onRecord} noValidate className="flex flex-col gap-3">
        <div className="grid grid-cols-2 gap-2">
          {box('coPpm', 'CO', 'ppm')}
          {box('co2Pct', 'CO2', '%')}
          {box('o2Pct', 'O2', '%')}
          {box('flueTemp', 'Flue temp.', (values?.tempUnit ?? unit) === 'F' ? '°F' : '°C')}
          {box('airTemp', 'Air temp.', (values?.tempUnit ?? unit) === 'F' ? '°F' : '°C')}
        </div>
        {live.error ? <p className="text-sm font-semibold text-danger">{live.error}</p> : null}
        {figures.length > 0 ? (
          <dl className="grid grid-cols-2 gap-x-3 gap-y-1 rounded-lg bg-paper p-2 text-sm tabular" data-testid={`figures-${testPoint}`}>
            {figures.map(([label, value]) => (
              <div key={label} className="flex justify-between gap-2">
                <dt className="text-ink-soft">{label}</dt>
                <dd className="font-semibold">{value}</dd>
              </div>
            ))}
          </dl>
        ) : null}
        {live.analysis && (live.analysis.warnings.length > 0 || coOverRange) ? (
          <ul className="flex flex-col gap-1 rounded-lg border-l-4 border-service bg-service-soft p-2 text-sm text-service" role="status">
            {coOverRange ? <li>CO is above this analyser’s range ({analyser!.coRangeMaxPpm} ppm): the true value may be higher.</li> : null}
            {live.analysis.warnings.map((w) => (
              <li key={w.code}>{w.message}</li>
            ))}
          </ul>
        ) : null}
        {live.verdict ? <VerdictItems items={live.verdict.items} /> : null}
        {saveError ? <p className="text-sm font-semibold text-danger" role="alert">{saveError}</p> : null}
        {!ctx.closed ? (
          <Button type="submit" disabled={saving || unchanged} variant={latest && !unchanged ? 'secondary' : 'primary'} className="w-full">
            {unchanged ? `Recorded ✓` : latest ? `Record correction (${TEST_POINT_LABELS[testPoint]})` : `Record ${TEST_POINT_LABELS[testPoint]} reading`}
          </Button>
        ) : null}
        {latest ? (
          <p className="text-xs text-ink-soft" data-testid={`recorded-${testPoint}`}>
            Recorded {new Date(latest.takenAt).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' })}
            {entry ? ` · ${entry.status === 'sent' ? 'sent' : entry.status === 'rejected' ? 'refused by the server' : 'waiting to send'}` : ''}
            {recorded.length > 1 ? ` · ${recorded.length} readings at this point (both kept)` : ''}
            {inspection.readings.filter((r) => r.testPoint === testPoint).length > recorded.length ? ' · earlier values kept as corrected' : ''}
          </p>
        ) : null}
      </form>
    </section>
  );
}
