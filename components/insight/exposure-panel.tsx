'use client';
// What a room CO reading means for the people breathing it: estimated COHb after the measured time,
// 1 h and 8 h at that level (resting or light work), beside the WHO figures, the site's own room CO
// rule and the symptom bands. Plain props and pure maths, so it works offline on the visit screen.
import { useState } from 'react';
import {
  ACTIVITY_LABELS,
  SYMPTOM_BANDS,
  SYMPTOM_SOURCE,
  averagingLabel,
  estimateExposure,
  type ActivityPreset,
  type JurisdictionRoomLimit,
} from '@/lib/exposure';
import { HIGH_ROOM_CO_ADVICE } from '@/components/safety/caution';
import { VerdictBadge } from '@/components/ui/verdict-badge';

function pct(value: number): string {
  return `${value < 10 ? value.toFixed(1) : Math.round(value)} %`;
}

function duration(minutes: number): string {
  return minutes < 60 ? `${Math.round(minutes)} min` : averagingLabel(minutes);
}

export function ExposurePanel({ room, coPpm, minutes, jurisdiction }: { room: string; coPpm: number; minutes: number | null; jurisdiction: JurisdictionRoomLimit | null }) {
  const [activity, setActivity] = useState<ActivityPreset>('resting');
  const estimate = estimateExposure({ coPpm, minutes, jurisdiction });
  const chosen = estimate.estimates.find((e) => e.activity === activity)!;
  const rows = [
    ...(chosen.atMeasured ? [{ label: `After the measured ${duration(chosen.atMeasured.minutes)}`, point: chosen.atMeasured }] : []),
    { label: 'After 1 h at this level', point: chosen.after1h },
    { label: 'After 8 h at this level', point: chosen.after8h },
  ];
  const residential = estimate.limits.filter((l) => l.kind === 'residential');
  return (
    <section aria-label={`CO exposure estimate for ${room}`} className="flex flex-col gap-3 rounded-lg border border-line bg-card p-3 text-sm" data-testid="exposure-panel">
      <header>
        <h3 className="text-base font-bold">
          Exposure estimate: {room}, {coPpm} ppm{estimate.measuredMinutes ? ` for ${duration(estimate.measuredMinutes)}` : ''}
        </h3>
        <p className="text-xs font-semibold uppercase tracking-wide text-service">Estimate — not a diagnosis</p>
      </header>

      {estimate.high ? (
        <div role="alert" className="rounded-lg border-2 border-danger bg-danger-soft p-3 text-ink">
          <p className="font-bold text-danger">Room CO is high: act now</p>
          <ul className="ml-4 list-disc">
            {HIGH_ROOM_CO_ADVICE.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </div>
      ) : null}

      <fieldset className="flex flex-wrap gap-2">
        <legend className="mb-1 text-xs font-semibold text-ink-soft">Who is breathing it</legend>
        {(Object.keys(ACTIVITY_LABELS) as ActivityPreset[]).map((key) => (
          <label key={key} className={`inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-md border px-3 ${activity === key ? 'border-copper bg-copper-soft font-semibold' : 'border-line'}`}>
            <input type="radio" name={`activity-${room}`} value={key} checked={activity === key} onChange={() => setActivity(key)} className="accent-copper" />
            {ACTIVITY_LABELS[key]}
          </label>
        ))}
      </fieldset>

      <table className="w-full text-left">
        <caption className="sr-only">Estimated carboxyhaemoglobin (COHb) for a {ACTIVITY_LABELS[activity].toLowerCase()}</caption>
        <thead className="text-xs uppercase text-ink-soft">
          <tr>
            <th scope="col" className="py-1">Time</th>
            <th scope="col" className="py-1">COHb (est.)</th>
            <th scope="col" className="py-1">Usual effect</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.label} className="border-t border-line">
              <td className="py-1.5 pr-2">{r.label}</td>
              <td className="whitespace-nowrap py-1.5 pr-2 font-bold tabular-nums" data-testid="cohb-estimate">{pct(r.point.cohbPct)}</td>
              <td className="py-1.5">{r.point.band.label}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="text-xs text-ink-soft">
        Starting from {estimate.startCohbPct} % (a typical non-smoker). Level it would settle at: {pct(chosen.steadyStatePct)}; it gets about two thirds of the way there in {duration(chosen.timeConstantMin)}. {chosen.source}.
      </p>

      <div>
        <h4 className="font-bold">Limits for this level</h4>
        <ul className="mt-1 flex flex-col gap-1">
          {estimate.jurisdiction ? (
            <li className="flex flex-wrap items-center gap-2" data-testid="jurisdiction-room-limit">
              <VerdictBadge level={estimate.jurisdiction.level} size="sm" />
              <span>
                {estimate.jurisdiction.jurisdictionName}: {estimate.jurisdiction.serviceAtPpm !== null ? `find the source at ${estimate.jurisdiction.serviceAtPpm} ppm` : ''}
                {estimate.jurisdiction.serviceAtPpm !== null && estimate.jurisdiction.dangerAtPpm !== null ? '; ' : ''}
                {estimate.jurisdiction.dangerAtPpm !== null ? `make safe at ${estimate.jurisdiction.dangerAtPpm} ppm` : ''}
                <span className="block text-xs text-ink-soft">{estimate.jurisdiction.source}</span>
              </span>
            </li>
          ) : (
            <li className="text-ink-soft">No room CO rule is configured for this site’s jurisdiction.</li>
          )}
          {residential.map((l) => (
            <li key={`${l.body}-${l.averagingMin}`} className="flex items-baseline gap-2">
              <span className={`w-16 shrink-0 text-xs font-bold uppercase ${l.exceeded ? 'text-danger' : 'text-clear'}`}>{l.exceeded ? 'Above' : 'Within'}</span>
              <span>
                {l.body}, {averagingLabel(l.averagingMin)} average: {l.ppm.toFixed(l.ppm < 10 ? 1 : 0)} ppm{l.statedAs ? ` (${l.statedAs})` : ''}
              </span>
            </li>
          ))}
        </ul>
        <p className="mt-1 text-xs text-ink-soft">An average limit compares with a level held for that long; a short reading above it is a warning sign, not a breach.</p>
      </div>

      <details>
        <summary className="cursor-pointer font-semibold">Symptom bands</summary>
        <ul className="mt-1">
          {SYMPTOM_BANDS.map((b) => (
            <li key={b.fromPct}>
              {b.toPct === null ? `Over ${b.fromPct} %` : `${b.fromPct}–${b.toPct} %`}: {b.label}
            </li>
          ))}
        </ul>
        <p className="text-xs text-ink-soft">{SYMPTOM_SOURCE}.</p>
      </details>
      <p className="text-xs text-ink-soft">{estimate.disclaimer}</p>
    </section>
  );
}
