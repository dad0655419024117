'use client';
// Type readings (or pick a site's appliance) and see the verdict with its explanation: the figures come
// from lib/combustion and the verdict from lib/limits, on the server via POST /api/v1/verdicts/preview,
// which this form validates with the same schema. Nothing is stored.
import { useState } from 'react';
import { useFieldArray, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { verdictPreviewSchema, type VerdictPreviewData, type VerdictPreviewInput } from '@/lib/validations/limits';
import { APPLIANCE_CATEGORIES, APPLIANCE_CATEGORY_LABELS, FUEL_IDS, FUEL_LABELS, TEST_POINT_LABELS, type TestPoint, type Verdict } from '@/lib/limits';
import { fetchJson } from '@/lib/fetch-json';
import { Field, Input } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SafetyCaution } from '@/components/safety/caution';
import { Select, applyServerErrors, errorProps } from '../../../_components/form-bits';

type SiteOption = { id: string; label: string; appliances: Array<{ id: string; label: string }> };
type PreviewResult = {
  date: string;
  verdict: Verdict;
  figures: Array<{ testPoint: TestPoint; analysis: { ratio: number | null; coAirFreeFromO2Ppm: number | null; flueLossPct: number | null; warnings: Array<{ code: string; message: string }> } }>;
};

const FIELDS = ['siteId', 'jurisdictionId', 'applianceId', 'category', 'fuel', 'date', 'readings', 'spillage', 'tightnessDropMbar'] as const;

function fmt(value: number | null, digits = 4): string {
  return value === null ? '—' : String(Number(value.toFixed(digits)));
}

export function VerdictPreview({ sites, jurisdictions, initialJurisdictionId, today }: { sites: SiteOption[]; jurisdictions: Array<{ id: string; name: string }>; initialJurisdictionId: string | null; today: string }) {
  const [where, setWhere] = useState<'jurisdiction' | 'site'>('jurisdiction');
  const [result, setResult] = useState<PreviewResult | null>(null);
  const [failure, setFailure] = useState('');
  const { register, handleSubmit, setError, formState, control, setValue } = useForm<VerdictPreviewInput, unknown, VerdictPreviewData>({
    resolver: zodResolver(verdictPreviewSchema),
    defaultValues: {
      siteId: '',
      applianceId: '',
      jurisdictionId: initialJurisdictionId ?? jurisdictions[0]?.id ?? '',
      category: 'boiler',
      fuel: 'natural-gas',
      date: today,
      readings: [{ testPoint: 'high_fire', coPpm: '', co2Pct: '', o2Pct: '', flueTempC: '', airTempC: '' }],
      roomChecks: [],
      spillage: '',
      tightnessDropMbar: '',
    },
  });
  const readings = useFieldArray({ control, name: 'readings' });
  const rooms = useFieldArray({ control, name: 'roomChecks' });
  const siteId = useWatch({ control, name: 'siteId' }) as string;
  const site = sites.find((s) => s.id === siteId);
  const e = formState.errors;

  function choose(next: 'jurisdiction' | 'site') {
    setWhere(next);
    // Only one of the two is sent; the other is cleared so the schema sees a single choice.
    if (next === 'site') setValue('jurisdictionId', '');
    else {
      setValue('siteId', '');
      setValue('applianceId', '');
      setValue('jurisdictionId', initialJurisdictionId ?? jurisdictions[0]?.id ?? '');
    }
  }

  async function onSubmit(data: VerdictPreviewData) {
    setFailure('');
    try {
      setResult(await fetchJson<PreviewResult>('/api/v1/verdicts/preview', { method: 'POST', body: JSON.stringify(data) }));
    } catch (err) {
      setResult(null);
      setFailure(applyServerErrors(err, setError, FIELDS) || 'Check the fields marked above.');
    }
  }

  const readingError = (i: number, name: 'coPpm' | 'co2Pct' | 'o2Pct' | 'flueTempC' | 'airTempC') => e.readings?.[i]?.[name];
  const showRoomAdvice = result !== null && result.verdict.items.some((item) => item.metric === 'room_co_ppm' && item.level !== 'clear');

  return (
    <div className="grid gap-5 lg:grid-cols-2">
      <form onSubmit={handleSubmit(onSubmit)} noValidate className="flex flex-col gap-4" aria-label="Readings to judge">
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-2 font-bold">Where</legend>
          <div className="flex flex-wrap gap-2" role="radiogroup" aria-label="Judge by">
            <label className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
              <input type="radio" name="where" checked={where === 'jurisdiction'} onChange={() => choose('jurisdiction')} /> A jurisdiction
            </label>
            <label className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
              <input type="radio" name="where" checked={where === 'site'} onChange={() => choose('site')} disabled={sites.length === 0} /> A site and appliance
            </label>
          </div>
          {where === 'jurisdiction' ? (
            <>
              <Field id="pv-jurisdiction" label="Jurisdiction" error={e.jurisdictionId?.message ?? e.siteId?.message}>
                <Select {...register('jurisdictionId')} {...errorProps('pv-jurisdiction', e.jurisdictionId)} options={jurisdictions.map((j) => ({ value: j.id, label: j.name }))} />
              </Field>
              <div className="grid gap-3 sm:grid-cols-2">
                <Field id="pv-category" label="Appliance category" error={e.category?.message}>
                  <Select {...register('category')} {...errorProps('pv-category', e.category)} options={APPLIANCE_CATEGORIES.map((c) => ({ value: c, label: APPLIANCE_CATEGORY_LABELS[c] }))} />
                </Field>
                <Field id="pv-fuel" label="Fuel" error={e.fuel?.message}>
                  <Select {...register('fuel')} {...errorProps('pv-fuel', e.fuel)} options={FUEL_IDS.map((f) => ({ value: f, label: FUEL_LABELS[f] }))} />
                </Field>
              </div>
            </>
          ) : (
            <div className="grid gap-3 sm:grid-cols-2">
              <Field id="pv-site" label="Site" error={e.siteId?.message}>
                <Select {...register('siteId')} {...errorProps('pv-site', e.siteId)} placeholder="Choose…" options={sites.map((s) => ({ value: s.id, label: s.label }))} />
              </Field>
              <Field id="pv-appliance" label="Appliance" error={e.applianceId?.message ?? e.category?.message}>
                <Select {...register('applianceId')} {...errorProps('pv-appliance', e.applianceId)} placeholder={site ? 'Choose…' : 'Choose a site first'} options={(site?.appliances ?? []).map((a) => ({ value: a.id, label: a.label }))} />
              </Field>
            </div>
          )}
          <Field id="pv-date" label="Date of the readings" error={e.date?.message} hint="Picks the profile versions in force that day.">
            <Input type="date" {...register('date')} {...errorProps('pv-date', e.date)} />
          </Field>
        </fieldset>

        {readings.fields.map((field, i) => (
          <fieldset key={field.id} className="flex flex-col gap-3 rounded-xl border border-line bg-white p-3">
            <legend className="px-1 font-bold">Reading at {TEST_POINT_LABELS[(field.testPoint as TestPoint) ?? 'high_fire']}</legend>
            <div className="grid grid-cols-2 gap-3">
              <Field id={`pv-r${i}-co`} label="CO (ppm)" error={readingError(i, 'coPpm')?.message}>
                <Input inputMode="decimal" {...register(`readings.${i}.coPpm`)} {...errorProps(`pv-r${i}-co`, readingError(i, 'coPpm'))} />
              </Field>
              <Field id={`pv-r${i}-co2`} label="CO2 (%)" error={readingError(i, 'co2Pct')?.message}>
                <Input inputMode="decimal" {...register(`readings.${i}.co2Pct`)} {...errorProps(`pv-r${i}-co2`, readingError(i, 'co2Pct'))} />
              </Field>
              <Field id={`pv-r${i}-o2`} label="O2 (%)" error={readingError(i, 'o2Pct')?.message}>
                <Input inputMode="decimal" {...register(`readings.${i}.o2Pct`)} {...errorProps(`pv-r${i}-o2`, readingError(i, 'o2Pct'))} />
              </Field>
              <Field id={`pv-r${i}-flue`} label="Flue temp (°C)" error={readingError(i, 'flueTempC')?.message}>
                <Input inputMode="decimal" {...register(`readings.${i}.flueTempC`)} {...errorProps(`pv-r${i}-flue`, readingError(i, 'flueTempC'))} />
              </Field>
              <Field id={`pv-r${i}-air`} label="Air temp (°C)" error={readingError(i, 'airTempC')?.message}>
                <Input inputMode="decimal" {...register(`readings.${i}.airTempC`)} {...errorProps(`pv-r${i}-air`, readingError(i, 'airTempC'))} />
              </Field>
            </div>
            {i > 0 ? <div><Button type="button" variant="ghost" onClick={() => readings.remove(i)}>Remove this reading</Button></div> : null}
          </fieldset>
        ))}
        {readings.fields.length < 2 ? (
          <div><Button type="button" variant="secondary" onClick={() => readings.append({ testPoint: 'low_fire', coPpm: '', co2Pct: '', o2Pct: '', flueTempC: '', airTempC: '' })}>Add a low-fire reading</Button></div>
        ) : null}

        {rooms.fields.map((field, i) => (
          <fieldset key={field.id} className="grid grid-cols-2 gap-3 rounded-xl border border-line bg-white p-3">
            <legend className="px-1 font-bold">Room check</legend>
            <Field id={`pv-room${i}`} label="Room" error={e.roomChecks?.[i]?.room?.message}>
              <Input {...register(`roomChecks.${i}.room`)} {...errorProps(`pv-room${i}`, e.roomChecks?.[i]?.room)} />
            </Field>
            <Field id={`pv-room${i}-co`} label="Room CO (ppm)" error={e.roomChecks?.[i]?.coPpm?.message}>
              <Input inputMode="decimal" {...register(`roomChecks.${i}.coPpm`)} {...errorProps(`pv-room${i}-co`, e.roomChecks?.[i]?.coPpm)} />
            </Field>
            <div className="col-span-2"><Button type="button" variant="ghost" onClick={() => rooms.remove(i)}>Remove this room check</Button></div>
          </fieldset>
        ))}
        <div><Button type="button" variant="secondary" onClick={() => rooms.append({ room: '', coPpm: '', minutes: '' })}>Add a room check</Button></div>

        <div className="grid grid-cols-2 gap-3">
          <Field id="pv-spillage" label="Spillage test" error={e.spillage?.message}>
            <Select {...register('spillage')} {...errorProps('pv-spillage', e.spillage)} placeholder="Not done" options={[{ value: 'pass', label: 'Pass' }, { value: 'fail', label: 'Fail' }]} />
          </Field>
          <Field id="pv-tightness" label="Tightness drop (mbar)" error={e.tightnessDropMbar?.message}>
            <Input inputMode="decimal" {...register('tightnessDropMbar')} {...errorProps('pv-tightness', e.tightnessDropMbar)} />
          </Field>
        </div>
        {e.readings?.message ? <Alert tone="error">{e.readings.message}</Alert> : null}
        {failure ? <Alert tone="error">{failure}</Alert> : null}
        <div><Button type="submit" disabled={formState.isSubmitting}>Show the verdict</Button></div>
      </form>

      <section aria-labelledby="result-heading" aria-live="polite" className="flex flex-col gap-3">
        <h2 id="result-heading" className="text-lg font-bold">Verdict</h2>
        {!result ? (
          <p className="text-ink-soft">Enter readings and choose “Show the verdict”.</p>
        ) : (
          <div className="flex flex-col gap-3" data-testid="preview-result">
            <div className="flex flex-wrap items-center gap-2">
              <VerdictBadge level={result.verdict.overall} size="lg" />
              <span className="text-sm text-ink-soft">on {result.date}</span>
            </div>
            {result.verdict.decidedBy ? (
              <p className="rounded-lg border border-line bg-white p-3 font-semibold" data-testid="decided-by">{result.verdict.decidedBy.explanation}</p>
            ) : null}
            <ul className="flex flex-col gap-2" aria-label="Each limit checked">
              {result.verdict.items.map((item, i) => (
                <li key={i} className="flex flex-col gap-1 rounded-lg border border-line bg-white p-3 text-sm">
                  <VerdictBadge level={item.level} size="sm" />
                  <p>{item.explanation}</p>
                </li>
              ))}
            </ul>
            {result.verdict.notJudged.length ? (
              <ul className="flex flex-col gap-1 text-sm text-ink-soft" aria-label="Figures not judged">
                {result.verdict.notJudged.map((n, i) => <li key={i}>{n.explanation}</li>)}
              </ul>
            ) : null}
            {result.figures.map((f) => (
              <div key={f.testPoint} className="rounded-lg border border-line bg-white p-3 text-sm">
                <p className="font-semibold">Figures at {TEST_POINT_LABELS[f.testPoint]}</p>
                <p>CO/CO2 ratio {fmt(f.analysis.ratio)} · air-free CO {fmt(f.analysis.coAirFreeFromO2Ppm, 0)} ppm · flue loss {fmt(f.analysis.flueLossPct, 1)} %</p>
                {f.analysis.warnings.map((w) => <p key={w.code} className="text-service">{w.message}</p>)}
              </div>
            ))}
          </div>
        )}
        <SafetyCaution showRoomCoAdvice={showRoomAdvice} />
      </section>
    </div>
  );
}
