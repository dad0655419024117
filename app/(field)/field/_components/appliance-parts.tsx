'use client';
// The parts of an appliance's inspection other than readings: its details, the checklist with the
// meter test, the analyser used, and "not tested". Each change is saved on the phone at once.
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { heatInputKw, CombustionInputError } from '@/lib/combustion';
import { APPLIANCE_CATEGORIES, APPLIANCE_CATEGORY_LABELS, FUEL_IDS, FUEL_LABELS } from '@/lib/limits';
import {
  applianceDetailsSchema,
  CHECKLIST_ITEMS,
  FLUE_TYPE_LABELS,
  FLUE_TYPES,
  meterTestSchema,
  type ApplianceDetails,
  type CheckAnswer,
  type ChecklistKey,
} from '@/lib/validations/inspection';
import { calibrationOverdue, formatPower, MIN_OVERRIDE_REASON_CHARS } from '@/lib/field';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field, inputClass } from '@/components/ui/field';
import { saveInspection, type VisitAppliance, type VisitContext } from './use-field';

type DetailsInput = z.input<typeof applianceDetailsSchema>;

const text = (v: number | null) => (v === null ? '' : String(v));

export function DetailsCard({ ctx, appliance }: { ctx: VisitContext; appliance: VisitAppliance }) {
  const inspection = ctx.inspectionOf(appliance.id);
  const details = inspection.details;
  const [editing, setEditing] = useState(false);
  const form = useForm<DetailsInput, unknown, ApplianceDetails>({
    resolver: zodResolver(applianceDetailsSchema),
    defaultValues: { ...details, make: details.make ?? '', model: details.model ?? '', serial: details.serial ?? '', ratedInputKw: text(details.ratedInputKw), mfrRatioMax: text(details.mfrRatioMax), mfrCoAirFreeMaxPpm: text(details.mfrCoAirFreeMaxPpm), mfrCoMaxPpm: text(details.mfrCoMaxPpm) },
  });
  const { register, handleSubmit, formState } = form;
  const err = (k: keyof DetailsInput) => formState.errors[k]?.message;
  const id = (k: string) => `${appliance.id}-${k}`;

  const save = handleSubmit(async (data) => {
    await saveInspection(ctx, appliance.id, { details: data, detailsConfirmed: true }, `Details — ${data.location}`);
    setEditing(false);
  });

  if (!editing) {
    return (
      <section aria-labelledby={id('details-title')} className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
        <div className="flex items-center justify-between gap-2">
          <h3 id={id('details-title')} className="text-base font-bold">
            Details
          </h3>
          {inspection.detailsConfirmed ? <span className="text-sm font-bold text-clear">Confirmed ✓</span> : null}
        </div>
        <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
          <dt className="text-ink-soft">Category</dt>
          <dd>{APPLIANCE_CATEGORY_LABELS[details.category]}</dd>
          <dt className="text-ink-soft">Fuel</dt>
          <dd>{FUEL_LABELS[details.fuel]}</dd>
          <dt className="text-ink-soft">Flue</dt>
          <dd>{FLUE_TYPE_LABELS[details.flueType]}</dd>
          <dt className="text-ink-soft">Location</dt>
          <dd>{details.location}</dd>
          <dt className="text-ink-soft">Make / model</dt>
          <dd>{[details.make, details.model].filter(Boolean).join(' ') || '—'}</dd>
          <dt className="text-ink-soft">Serial</dt>
          <dd>{details.serial ?? '—'}</dd>
          <dt className="text-ink-soft">Rated input</dt>
          <dd>{formatPower(details.ratedInputKw, ctx.field.prefs.powerUnit)}</dd>
          <dt className="text-ink-soft">Maker’s limits</dt>
          <dd>
            {[details.mfrRatioMax !== null ? `ratio ${details.mfrRatioMax}` : null, details.mfrCoAirFreeMaxPpm !== null ? `air-free CO ${details.mfrCoAirFreeMaxPpm} ppm` : null, details.mfrCoMaxPpm !== null ? `CO ${details.mfrCoMaxPpm} ppm` : null]
              .filter(Boolean)
              .join(', ') || 'None given'}
          </dd>
        </dl>
        {!ctx.closed ? (
          <div className="flex gap-2">
            {!inspection.detailsConfirmed ? (
              <Button onClick={() => void saveInspection(ctx, appliance.id, { detailsConfirmed: true }, `Details confirmed — ${details.location}`)} className="flex-1">
                Details are right
              </Button>
            ) : null}
            <Button variant="secondary" onClick={() => setEditing(true)} className="flex-1">
              Edit details
            </Button>
          </div>
        ) : null}
      </section>
    );
  }

  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-3 rounded-xl border border-copper bg-card p-3" aria-label="Edit appliance details">
      <h3 className="text-base font-bold">Edit details</h3>
      <Field id={id('category')} label="Category" error={err('category')}>
        <select id={id('category')} className={inputClass} {...register('category')}>
          {APPLIANCE_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {APPLIANCE_CATEGORY_LABELS[c]}
            </option>
          ))}
        </select>
      </Field>
      <Field id={id('fuel')} label="Fuel" error={err('fuel')}>
        <select id={id('fuel')} className={inputClass} {...register('fuel')}>
          {FUEL_IDS.map((f) => (
            <option key={f} value={f}>
              {FUEL_LABELS[f]}
            </option>
          ))}
        </select>
      </Field>
      <Field id={id('flueType')} label="Flue arrangement" error={err('flueType')}>
        <select id={id('flueType')} className={inputClass} {...register('flueType')}>
          {FLUE_TYPES.map((f) => (
            <option key={f} value={f}>
              {FLUE_TYPE_LABELS[f]}
            </option>
          ))}
        </select>
      </Field>
      <Field id={id('location')} label="Location" error={err('location')}>
        <input id={id('location')} className={inputClass} {...register('location')} />
      </Field>
      <div className="grid grid-cols-2 gap-2">
        <Field id={id('make')} label="Make" error={err('make')}>
          <input id={id('make')} className={inputClass} {...register('make')} />
        </Field>
        <Field id={id('model')} label="Model" error={err('model')}>
          <input id={id('model')} className={inputClass} {...register('model')} />
        </Field>
      </div>
      <Field id={id('serial')} label="Serial" error={err('serial')}>
        <input id={id('serial')} className={inputClass} {...register('serial')} />
      </Field>
      <Field id={id('ratedInputKw')} label="Rated heat input (kW)" error={err('ratedInputKw')}>
        <input id={id('ratedInputKw')} inputMode="decimal" className={inputClass} {...register('ratedInputKw')} />
      </Field>
      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-semibold">Maker’s limits, if the instructions give them</legend>
        <Field id={id('mfrRatioMax')} label="CO/CO2 ratio (e.g. 0.004)" error={err('mfrRatioMax')}>
          <input id={id('mfrRatioMax')} inputMode="decimal" className={inputClass} {...register('mfrRatioMax')} />
        </Field>
        <div className="grid grid-cols-2 gap-2">
          <Field id={id('mfrCoAirFreeMaxPpm')} label="Air-free CO (ppm)" error={err('mfrCoAirFreeMaxPpm')}>
            <input id={id('mfrCoAirFreeMaxPpm')} inputMode="decimal" className={inputClass} {...register('mfrCoAirFreeMaxPpm')} />
          </Field>
          <Field id={id('mfrCoMaxPpm')} label="CO as measured (ppm)" error={err('mfrCoMaxPpm')}>
            <input id={id('mfrCoMaxPpm')} inputMode="decimal" className={inputClass} {...register('mfrCoMaxPpm')} />
          </Field>
        </div>
      </fieldset>
      <div className="flex gap-2">
        <Button type="submit" className="flex-1">
          Save details
        </Button>
        <Button type="button" variant="secondary" onClick={() => setEditing(false)} className="flex-1">
          Cancel
        </Button>
      </div>
    </form>
  );
}

const ANSWERS: CheckAnswer[] = ['pass', 'fail', 'na'];

function AnswerButtons({ label, value, passText, failText, disabled, onAnswer }: { label: string; value: CheckAnswer | null; passText: string; failText: string; disabled: boolean; onAnswer: (a: CheckAnswer) => void }) {
  const words: Record<CheckAnswer, string> = { pass: passText, fail: failText, na: 'N/A' };
  const on: Record<CheckAnswer, string> = { pass: 'border-clear bg-clear text-white', fail: 'border-danger bg-danger text-white', na: 'border-ink bg-ink text-paper' };
  return (
    <div role="group" aria-label={label} className="grid grid-cols-[1fr_1fr_auto] gap-1">
      {ANSWERS.map((a) => (
        <button key={a} type="button" disabled={disabled} aria-pressed={value === a} onClick={() => onAnswer(a)} className={`min-h-11 rounded-lg border px-2 text-sm font-semibold ${value === a ? on[a] : 'border-line bg-white text-ink'}`}>
          {value === a ? (a === 'pass' ? '✓ ' : a === 'fail' ? '✕ ' : '') : ''}
          {words[a]}
        </button>
      ))}
    </div>
  );
}

type MeterInput = z.input<typeof meterTestSchema>;

function MeterTestForm({ ctx, appliance, details }: { ctx: VisitContext; appliance: VisitAppliance; details: ApplianceDetails }) {
  const inspection = ctx.inspectionOf(appliance.id);
  const saved = inspection.meterTest;
  const form = useForm<MeterInput, unknown, z.output<typeof meterTestSchema>>({
    resolver: zodResolver(meterTestSchema),
    defaultValues: saved ? { ...saved, volume: String(saved.volume), seconds: String(saved.seconds), calorificValue: String(saved.calorificValue) } : { volume: '', volumeUnit: 'm3', seconds: '', calorificValue: '', cvUnit: 'MJ/m3' },
  });
  const { register, handleSubmit, formState, watch } = form;
  const v = watch();
  const parsed = meterTestSchema.safeParse(v);
  let result: { grossKw: number; netKw: number; gasRate: number; gasRateUnit: string } | null = null;
  let problem: string | null = null;
  if (parsed.success) {
    try {
      result = heatInputKw({ fuel: details.fuel, ...parsed.data });
    } catch (err) {
      problem = err instanceof CombustionInputError ? err.message : 'The meter test could not be worked out.';
    }
  }
  const unit = ctx.field.prefs.powerUnit;
  const id = (k: string) => `${appliance.id}-meter-${k}`;
  const err = (k: keyof MeterInput) => formState.errors[k]?.message;
  const save = handleSubmit((data) => saveInspection(ctx, appliance.id, { meterTest: data }, `Meter test — ${details.location}`));
  const ofRated = result && details.ratedInputKw ? Math.round((result.grossKw / details.ratedInputKw) * 100) : null;

  return (
    <form onSubmit={save} noValidate className="flex flex-col gap-2 rounded-lg bg-paper p-2" aria-label="Meter test">
      <p className="text-sm font-semibold">Meter test (heat input)</p>
      <div className="grid grid-cols-2 gap-2">
        <Field id={id('volume')} label="Volume passed" error={err('volume')}>
          <input id={id('volume')} inputMode="decimal" disabled={ctx.closed} className={inputClass} {...register('volume')} />
        </Field>
        <Field id={id('volumeUnit')} label="Meter unit" error={err('volumeUnit')}>
          <select id={id('volumeUnit')} disabled={ctx.closed} className={inputClass} {...register('volumeUnit')}>
            <option value="m3">m³</option>
            <option value="ft3">ft³</option>
          </select>
        </Field>
        <Field id={id('seconds')} label="Timed (seconds)" error={err('seconds')}>
          <input id={id('seconds')} inputMode="decimal" disabled={ctx.closed} className={inputClass} {...register('seconds')} />
        </Field>
        <Field id={id('calorificValue')} label="Gross CV" error={err('calorificValue')}>
          <input id={id('calorificValue')} inputMode="decimal" disabled={ctx.closed} className={inputClass} {...register('calorificValue')} />
        </Field>
        <Field id={id('cvUnit')} label="CV unit" error={err('cvUnit')}>
          <select id={id('cvUnit')} disabled={ctx.closed} className={inputClass} {...register('cvUnit')}>
            <option value="MJ/m3">MJ/m³</option>
            <option value="Btu/ft3">Btu/ft³</option>
          </select>
        </Field>
      </div>
      {result ? (
        <p className="text-sm tabular" data-testid="heat-input">
          Gas rate {result.gasRate.toFixed(3)} {result.gasRateUnit} · {formatPower(result.grossKw, unit)} gross · {formatPower(result.netKw, unit)} net
          {ofRated !== null ? ` · ${ofRated} % of rated` : ''}
        </p>
      ) : null}
      {problem ? <p className="text-sm font-semibold text-danger">{problem}</p> : null}
      {!ctx.closed ? (
        <Button type="submit" variant="secondary">
          Save meter test
        </Button>
      ) : null}
      {saved ? <p className="text-xs text-ink-soft">Saved: {saved.volume} {saved.volumeUnit === 'm3' ? 'm³' : 'ft³'} in {saved.seconds} s at {saved.calorificValue} {saved.cvUnit}</p> : null}
    </form>
  );
}

export function Checklist({ ctx, appliance }: { ctx: VisitContext; appliance: VisitAppliance }) {
  const inspection = ctx.inspectionOf(appliance.id);
  const details = inspection.details;
  const [pressure, setPressure] = useState(inspection.operatingPressureMbar === null ? '' : String(inspection.operatingPressureMbar));
  const [pressureError, setPressureError] = useState<string | null>(null);

  const answer = (key: ChecklistKey, value: CheckAnswer) => {
    const item = CHECKLIST_ITEMS.find((i) => i.key === key)!;
    const label = `${item.label}: ${value === 'na' ? 'N/A' : value === 'pass' ? item.pass : item.fail} — ${details.location}`;
    if (key === 'spillage') return saveInspection(ctx, appliance.id, { spillage: value }, label);
    return saveInspection(ctx, appliance.id, { checklist: { ...inspection.checklist, [key]: value } }, label);
  };

  const savePressure = () => {
    const raw = pressure.trim().replace(',', '.');
    if (raw === '') {
      setPressureError(null);
      if (inspection.operatingPressureMbar !== null) void saveInspection(ctx, appliance.id, { operatingPressureMbar: null }, `Operating pressure cleared — ${details.location}`);
      return;
    }
    const n = Number(raw);
    if (!Number.isFinite(n) || n < 0 || n > 200) {
      setPressureError('Operating pressure must be from 0 to 200 mbar');
      return;
    }
    setPressureError(null);
    if (n !== inspection.operatingPressureMbar) void saveInspection(ctx, appliance.id, { operatingPressureMbar: n }, `Operating pressure ${n} mbar — ${details.location}`);
  };

  return (
    <section aria-labelledby={`${appliance.id}-checks`} className="flex flex-col gap-3 rounded-xl border border-line bg-card p-3">
      <h3 id={`${appliance.id}-checks`} className="text-base font-bold">
        Checks
      </h3>
      <ul className="flex flex-col gap-3">
        {CHECKLIST_ITEMS.map((item) => {
          const value = item.key === 'spillage' ? inspection.spillage : inspection.checklist[item.key];
          return (
            <li key={item.key} className="flex flex-col gap-1" data-testid={`check-${item.key}`}>
              <p className="text-sm font-semibold">{item.label}</p>
              <p className="text-xs text-ink-soft">{item.hint}</p>
              <AnswerButtons label={item.label} value={value ?? null} passText={item.pass} failText={item.fail} disabled={ctx.closed} onAnswer={(a) => void answer(item.key, a)} />
              {item.key === 'operatingPressure' ? (
                <div className="flex flex-col gap-2">
                  <Field id={`${appliance.id}-pressure`} label="Operating pressure (mbar)" error={pressureError ?? undefined}>
                    <input
                      id={`${appliance.id}-pressure`}
                      inputMode="decimal"
                      disabled={ctx.closed}
                      value={pressure}
                      onChange={(e) => setPressure(e.target.value)}
                      onBlur={savePressure}
                      aria-invalid={pressureError ? true : undefined}
                      className={inputClass}
                    />
                  </Field>
                  <MeterTestForm ctx={ctx} appliance={appliance} details={details} />
                </div>
              ) : null}
            </li>
          );
        })}
      </ul>
    </section>
  );
}

export function AnalyserPicker({ ctx, appliance }: { ctx: VisitContext; appliance: VisitAppliance }) {
  const inspection = ctx.inspectionOf(appliance.id);
  const analysers = ctx.field.bundle?.analysers ?? [];
  const chosen = analysers.find((a) => a.id === inspection.analyserId) ?? null;
  const overdue = chosen ? calibrationOverdue(chosen.calibrationDue, ctx.date) : false;
  const [reason, setReason] = useState(inspection.analyserOverrideReason ?? '');
  const id = `${appliance.id}-analyser`;
  const short = overdue && reason.trim().length < MIN_OVERRIDE_REASON_CHARS;

  const choose = (analyserId: string) => {
    const a = analysers.find((x) => x.id === analyserId);
    void saveInspection(ctx, appliance.id, { analyserId: analyserId || null }, a ? `Analyser ${a.serial} — ${inspection.details.location}` : `Analyser cleared — ${inspection.details.location}`);
  };
  const saveReason = () => {
    const trimmed = reason.trim();
    if (trimmed !== (inspection.analyserOverrideReason ?? '')) void saveInspection(ctx, appliance.id, { analyserOverrideReason: trimmed || null }, `Reason for analyser ${chosen?.serial ?? ''}`);
  };

  return (
    <section aria-labelledby={`${id}-title`} className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3">
      <h3 id={`${id}-title`} className="text-base font-bold">
        Analyser used
      </h3>
      <Field id={id} label="From the register">
        <select id={id} value={inspection.analyserId ?? ''} disabled={ctx.closed} onChange={(e) => choose(e.target.value)} className={inputClass}>
          <option value="">Choose the analyser…</option>
          {analysers.map((a) => {
            const late = calibrationOverdue(a.calibrationDue, ctx.date);
            return (
              <option key={a.id} value={a.id}>
                {a.serial} · {a.make} {a.model} · {late ? `CALIBRATION OVERDUE since ${a.calibrationDue}` : `calibrated to ${a.calibrationDue}`}
                {a.assignedToMe ? ' · yours' : ''}
              </option>
            );
          })}
        </select>
      </Field>
      {chosen && !overdue ? (
        <p className="text-sm text-clear">
          In calibration until {chosen.calibrationDue} · CO range to {chosen.coRangeMaxPpm} ppm
        </p>
      ) : null}
      {overdue && chosen ? (
        <>
          <Alert tone="warning" title="Calibration overdue">
            {chosen.serial} was due for calibration on {chosen.calibrationDue}. Its readings may be wrong. Use a calibrated analyser if you can; if not, say why this one is used — the reason is kept with the readings.
          </Alert>
          <Field id={`${id}-reason`} label="Why is this analyser being used?" error={short ? `Give a reason of at least ${MIN_OVERRIDE_REASON_CHARS} characters` : undefined}>
            <textarea id={`${id}-reason`} rows={2} value={reason} disabled={ctx.closed} onChange={(e) => setReason(e.target.value)} onBlur={saveReason} className={inputClass} aria-invalid={short ? true : undefined} />
          </Field>
        </>
      ) : null}
    </section>
  );
}

export function NotTested({ ctx, appliance }: { ctx: VisitContext; appliance: VisitAppliance }) {
  const inspection = ctx.inspectionOf(appliance.id);
  const [reason, setReason] = useState(inspection.notTestedReason ?? '');
  const [error, setError] = useState<string | null>(null);
  const save = () => {
    const trimmed = reason.trim();
    if (trimmed.length > 0 && trimmed.length < 3) {
      setError('Say why in a few words');
      return;
    }
    setError(null);
    if (trimmed !== (inspection.notTestedReason ?? '')) void saveInspection(ctx, appliance.id, { notTestedReason: trimmed || null }, trimmed ? `Not tested — ${inspection.details.location}` : `Marked as tested — ${inspection.details.location}`);
  };
  return (
    <details className="rounded-xl border border-dashed border-line bg-card p-3" open={Boolean(inspection.notTestedReason)}>
      <summary className="min-h-11 cursor-pointer py-2 text-sm font-semibold">Can’t test this appliance?</summary>
      <Field id={`${appliance.id}-not-tested`} label="Why it was not tested" error={error ?? undefined} hint="For example: capped off, no access to it, occupant refused.">
        <textarea id={`${appliance.id}-not-tested`} rows={2} value={reason} disabled={ctx.closed} onChange={(e) => setReason(e.target.value)} onBlur={save} className={inputClass} />
      </Field>
    </details>
  );
}
