'use client';
// An appliance's history at a glance: the "getting worse" flag, charts of CO/CO2 ratio, air-free CO
// and flue loss against the limits in force on each date, a table of the same figures, and what to
// check. Takes the plain ApplianceHistory payload, so it renders the same from a cache offline.
import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { ApplianceHistory, HistoryPoint, LimitPair } from '@/lib/insight';
import { HINTS_NOTE } from '@/lib/insight';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { HintList } from './hint-list';

type SeriesKey = 'ratio' | 'coAirFreePpm' | 'flueLossPct';

const SERIES: Array<{ key: SeriesKey; title: string; unit: string; digits: number }> = [
  { key: 'ratio', title: 'CO/CO2 ratio', unit: '', digits: 4 },
  { key: 'coAirFreePpm', title: 'Air-free CO', unit: 'ppm', digits: 0 },
  { key: 'flueLossPct', title: 'Flue loss', unit: '%', digits: 1 },
];

function fmt(value: number | null, digits: number, unit: string): string {
  if (value === null) return '—';
  return `${value.toFixed(digits)}${unit ? ` ${unit}` : ''}`;
}

function TrendChart({ points, series }: { points: HistoryPoint[]; series: (typeof SERIES)[number] }) {
  const data = points.map((p) => {
    const limit: LimitPair = p.limits[series.key];
    return { date: p.date, value: p[series.key], service: limit.service, danger: limit.danger };
  });
  const hasData = data.some((d) => d.value !== null);
  const hasService = data.some((d) => d.service !== null);
  const hasDanger = data.some((d) => d.danger !== null);
  const label = `${series.title}${series.unit ? ` (${series.unit})` : ''}`;
  return (
    <figure className="rounded-lg border border-line bg-card p-2">
      <figcaption className="mb-1 flex flex-wrap items-baseline justify-between gap-x-2 text-sm font-bold">
        {label}
        <span className="text-xs font-normal text-ink-soft">
          <span className="mr-2 inline-block h-0.5 w-4 bg-ink align-middle" aria-hidden /> measured
          {hasService ? (
            <>
              <span className="mx-1 ml-3 inline-block w-4 border-t-2 border-dashed border-service align-middle" aria-hidden /> service limit
            </>
          ) : null}
          {hasDanger ? (
            <>
              <span className="mx-1 ml-3 inline-block w-4 border-t-2 border-dotted border-danger align-middle" aria-hidden /> danger limit
            </>
          ) : null}
        </span>
      </figcaption>
      {hasData ? (
        <div className="h-40 w-full" role="img" aria-label={`${label} at each inspection; figures in the table below`}>
          <ResponsiveContainer width="100%" height="100%">
            <LineChart data={data} margin={{ top: 6, right: 8, bottom: 0, left: 0 }}>
              <CartesianGrid stroke="#dcd7cc" strokeDasharray="2 4" />
              <XAxis dataKey="date" tick={{ fontSize: 11 }} tickFormatter={(d: string) => d.slice(0, 7)} />
              <YAxis tick={{ fontSize: 11 }} width={52} tickFormatter={(v: number) => v.toFixed(series.digits)} />
              <Tooltip formatter={(v) => (typeof v === 'number' ? v.toFixed(series.digits + 1) : String(v))} />
              <Line type="monotone" dataKey="value" name="Measured" stroke="#1b2030" strokeWidth={2} dot={{ r: 3 }} connectNulls isAnimationActive={false} />
              {hasService ? <Line type="stepAfter" dataKey="service" name="Service limit" stroke="#8f5000" strokeDasharray="6 4" dot={false} isAnimationActive={false} /> : null}
              {hasDanger ? <Line type="stepAfter" dataKey="danger" name="Danger limit" stroke="#a61b14" strokeDasharray="2 3" dot={false} isAnimationActive={false} /> : null}
            </LineChart>
          </ResponsiveContainer>
        </div>
      ) : (
        <p className="py-4 text-center text-sm text-ink-soft">No figures recorded for this.</p>
      )}
    </figure>
  );
}

export function ApplianceTrend({ history, compact = false }: { history: ApplianceHistory; compact?: boolean }) {
  const { points, trend, hints } = history;
  return (
    <section aria-label="Appliance history" className="flex flex-col gap-3" data-testid="appliance-trend">
      {trend.worsening ? (
        <div role="status" className="rounded-lg border-2 border-service bg-service-soft p-3 text-sm text-ink" data-testid="getting-worse-flag">
          <p className="flex items-center gap-2 font-bold text-service">
            <svg width="18" height="18" viewBox="0 0 20 20" aria-hidden>
              <path d="M2 16l6-6 3 3 7-8" stroke="currentColor" strokeWidth="2.4" fill="none" strokeLinecap="round" strokeLinejoin="round" />
              <path d="M13 5h5v5" stroke="currentColor" strokeWidth="2.4" fill="none" strokeLinecap="round" />
            </svg>
            Getting worse
          </p>
          <p className="mt-1">{trend.message.replace(/^Getting worse: /, '')}</p>
        </div>
      ) : (
        <p className="text-sm text-ink-soft" data-testid="trend-steady">{trend.message}</p>
      )}

      {points.length === 0 ? (
        <p className="text-sm text-ink-soft">No finished inspections of this appliance yet.</p>
      ) : (
        <>
          <div className={`grid gap-3 ${compact ? '' : 'md:grid-cols-3'}`}>
            {SERIES.map((s) => (
              <TrendChart key={s.key} points={points} series={s} />
            ))}
          </div>
          <div className="overflow-x-auto rounded-lg border border-line bg-card">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Worst figures of each inspection with the service limit in force on its date</caption>
              <thead className="bg-paper text-xs uppercase text-ink-soft">
                <tr>
                  <th scope="col" className="px-2 py-1.5">Date</th>
                  <th scope="col" className="px-2 py-1.5">Verdict</th>
                  {SERIES.map((s) => (
                    <th key={s.key} scope="col" className="px-2 py-1.5">{s.title}</th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {[...points].reverse().map((p) => (
                  <tr key={p.inspectionId} className="border-t border-line">
                    <td className="whitespace-nowrap px-2 py-1.5">{p.date}</td>
                    <td className="px-2 py-1.5">{p.verdict ? <VerdictBadge level={p.verdict} size="sm" /> : '—'}</td>
                    {SERIES.map((s) => (
                      <td key={s.key} className="whitespace-nowrap px-2 py-1.5 tabular-nums">
                        {fmt(p[s.key], s.digits, s.unit)}
                        {p.limits[s.key].service !== null ? <span className="block text-xs text-ink-soft">limit {fmt(p.limits[s.key].service, s.digits, s.unit)}</span> : null}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      )}

      {hints.length > 0 ? (
        <section aria-label="Things to check" className="rounded-lg border border-line bg-card p-3 text-sm" data-testid="diagnostic-hints">
          <h3 className="font-bold">Things to check</h3>
          <p className="text-xs text-ink-soft">{HINTS_NOTE}</p>
          <HintList hints={hints} />
        </section>
      ) : null}
    </section>
  );
}
