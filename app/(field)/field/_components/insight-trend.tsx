'use client';
// An appliance's history on the phone: the "getting worse" flag (word and shape, never colour
// alone), the CO/CO2 ratio of the last few inspections against the limit in force on each date as a
// small inline SVG line and a table, and what to check. Reads the trend the server put in the cached
// visit bundle, so it shows offline and adds no chart library to the visit screen.
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { HintList } from '@/components/insight/hint-list';
import { formatRatio, type FieldTrend, type TrendPoint } from '@/lib/field';

const shortDate = (date: string) => new Date(`${date}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });

/** A rising line with an arrow head: the flag's shape. */
function RisingShape() {
  return (
    <svg width="20" height="20" viewBox="0 0 20 20" aria-hidden className="shrink-0">
      <path d="M2 16l6-6 3 3 7-8" stroke="currentColor" strokeWidth="2.4" fill="none" strokeLinecap="round" strokeLinejoin="round" />
      <path d="M13 5h5v5" stroke="currentColor" strokeWidth="2.4" fill="none" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}

function latestWithRatio(points: TrendPoint[]): (TrendPoint & { ratio: number }) | null {
  const found = [...points].reverse().find((p) => p.ratio !== null);
  return found ? (found as TrendPoint & { ratio: number }) : null;
}

function percentOfLimit(p: TrendPoint): number | null {
  return p.ratio !== null && p.serviceLimit !== null && p.serviceLimit > 0 ? Math.round((p.ratio / p.serviceLimit) * 100) : null;
}

const sentence = (text: string) => text.charAt(0).toUpperCase() + text.slice(1);

/** The reasons in a few words, for the visit overview's cards. */
function shortReasons(trend: FieldTrend): string {
  const parts: string[] = [];
  const rising = trend.points.filter((p) => p.ratio !== null).slice(-3);
  if (trend.reasons.includes('rising')) parts.push(`CO/CO2 ratio rose at each of the last 3 inspections (${rising.map((p) => formatRatio(p.ratio)).join(' → ')})`);
  const latest = latestWithRatio(trend.points);
  const pct = latest ? percentOfLimit(latest) : null;
  if (trend.reasons.includes('over_half_limit') && pct !== null) parts.push(`latest ratio is ${pct} % of its service limit`);
  return parts.join('; ');
}

export function TrendFlag({ trend, compact = false }: { trend: FieldTrend; compact?: boolean }) {
  if (!trend.worsening) return null;
  return (
    <div className="rounded-lg border-2 border-service bg-service-soft p-2 text-sm text-ink" data-testid="getting-worse-flag">
      <p className="flex items-center gap-2 font-bold text-service">
        <RisingShape />
        Getting worse
      </p>
      <p className="mt-0.5">{compact ? `${shortReasons(trend)}.` : sentence(trend.message.replace(/^Getting worse: /, ''))}</p>
    </div>
  );
}

/** The ratio at each inspection (solid line, dots) and the service limit in force then (dashed). */
export function RatioSparkline({ points, width = 132, height = 40 }: { points: TrendPoint[]; width?: number; height?: number }) {
  const withRatio = points.filter((p) => p.ratio !== null);
  if (withRatio.length < 2) return null;
  const top = Math.max(...points.map((p) => Math.max(p.ratio ?? 0, p.serviceLimit ?? 0))) * 1.1 || 1;
  const pad = 4;
  const x = (i: number) => pad + (i * (width - 2 * pad)) / Math.max(points.length - 1, 1);
  const y = (v: number) => height - pad - (v / top) * (height - 2 * pad);
  const line = points.flatMap((p, i) => (p.ratio === null ? [] : [`${x(i).toFixed(1)},${y(p.ratio).toFixed(1)}`])).join(' ');
  const limit = points.flatMap((p, i) => (p.serviceLimit === null ? [] : [`${x(i).toFixed(1)},${y(p.serviceLimit).toFixed(1)}`])).join(' ');
  const limits = [...new Set(points.map((p) => p.serviceLimit).filter((v): v is number => v !== null))];
  const label = `CO/CO2 ratio at the last ${points.length} inspections: ${points.map((p) => formatRatio(p.ratio)).join(', ')}${limits.length ? `; service limit ${limits.join(', then ')}` : ''}`;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={label} className="h-auto max-w-full shrink-0" data-testid="ratio-sparkline">
      <rect x="0" y="0" width={width} height={height} rx="4" className="fill-paper" />
      {limit ? <polyline points={limit} fill="none" stroke="currentColor" strokeWidth="1.5" strokeDasharray="4 3" className="text-service" /> : null}
      <polyline points={line} fill="none" stroke="currentColor" strokeWidth="2" strokeLinejoin="round" className="text-ink" />
      {points.map((p, i) =>
        p.ratio === null ? null : <circle key={`${p.date}-${i}`} cx={x(i)} cy={y(p.ratio)} r={i === points.length - 1 ? 3.2 : 2.2} className="fill-ink" />,
      )}
    </svg>
  );
}

function Legend() {
  return (
    <p className="flex flex-wrap gap-x-3 text-xs text-ink-soft" aria-hidden>
      <span>
        <span className="mr-1 inline-block h-0.5 w-4 bg-ink align-middle" />
        ratio
      </span>
      <span>
        <span className="mr-1 inline-block w-4 border-t-2 border-dashed border-service align-middle" />
        service limit
      </span>
    </p>
  );
}

/** For a card on the visit overview: the flag in brief, or one quiet line when nothing is rising. */
export function TrendSummary({ trend }: { trend: FieldTrend | undefined }) {
  if (!trend || trend.inspections === 0) return null;
  const latest = latestWithRatio(trend.points);
  return (
    <div className="mt-2 flex flex-col gap-2" data-testid="trend-summary">
      <TrendFlag trend={trend} compact />
      <div className="flex items-center gap-3">
        <RatioSparkline points={trend.points} />
        <p className="text-xs text-ink-soft">
          {trend.worsening ? null : <span className="block" data-testid="trend-steady">{trend.message}</span>}
          {latest ? (
            <span className="block tabular">
              Last ratio {formatRatio(latest.ratio)} on {shortDate(latest.date)}
              {latest.serviceLimit !== null ? ` (limit ${latest.serviceLimit})` : ''}
            </span>
          ) : null}
        </p>
      </div>
    </div>
  );
}

/** For the appliance screen: the flag in full, the ratio line and table, and what to check. */
export function TrendDetail({ trend, headingId }: { trend: FieldTrend | undefined; headingId: string }) {
  if (!trend) return null;
  const rows = [...trend.points].reverse();
  return (
    <section aria-labelledby={headingId} className="flex flex-col gap-2 rounded-xl border border-line bg-card p-3" data-testid="appliance-history">
      <h3 id={headingId} className="text-base font-bold">
        Earlier inspections
      </h3>
      {trend.inspections === 0 ? (
        <p className="text-sm text-ink-soft">No finished inspections of this appliance on record.</p>
      ) : (
        <>
          <TrendFlag trend={trend} />
          {trend.worsening ? null : (
            <p className="text-sm text-ink-soft" data-testid="trend-steady">
              {trend.message}
            </p>
          )}
          {trend.points.filter((p) => p.ratio !== null).length >= 2 ? (
            <div className="flex flex-col gap-1">
              <RatioSparkline points={trend.points} width={300} height={64} />
              <Legend />
            </div>
          ) : null}
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">CO/CO2 ratio at each earlier inspection, newest first, against the service limit in force on its date</caption>
              <thead className="text-xs uppercase text-ink-soft">
                <tr>
                  <th scope="col" className="py-1 pr-2">Date</th>
                  <th scope="col" className="py-1 pr-2">Ratio</th>
                  <th scope="col" className="py-1 pr-2">Limit</th>
                  <th scope="col" className="py-1">Verdict</th>
                </tr>
              </thead>
              <tbody>
                {rows.map((p, i) => {
                  const pct = percentOfLimit(p);
                  return (
                    <tr key={`${p.date}-${i}`} className="border-t border-line" data-testid="trend-row">
                      <td className="whitespace-nowrap py-1.5 pr-2">{shortDate(p.date)}</td>
                      <td className="whitespace-nowrap py-1.5 pr-2 tabular">
                        {formatRatio(p.ratio)}
                        {pct !== null ? <span className="block text-xs text-ink-soft">{pct} % of limit</span> : null}
                      </td>
                      <td className="whitespace-nowrap py-1.5 pr-2 tabular">{p.serviceLimit ?? '—'}</td>
                      <td className="py-1.5">{p.verdict ? <VerdictBadge level={p.verdict} size="sm" /> : '—'}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          {trend.inspections > trend.points.length ? (
            <p className="text-xs text-ink-soft">The latest {trend.points.length} of {trend.inspections} inspections; the flag looks at them all.</p>
          ) : null}
          {trend.hints.length > 0 ? (
            <details className="text-sm" data-testid="trend-hints">
              <summary className="min-h-11 cursor-pointer py-2 font-semibold text-copper-dark">Things to check ({trend.hints.length})</summary>
              <p className="text-xs text-ink-soft">Suggestions from common trade practice, not a verdict; the manufacturer’s instructions come first.</p>
              <HintList hints={trend.hints} />
            </details>
          ) : null}
        </>
      )}
    </section>
  );
}
