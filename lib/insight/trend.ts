// The "getting worse" flag for an appliance's CO/CO2 ratio across its inspections. Pure: the field
// app computes it offline from the cached history, the server for the office.

export type RatioSample = {
  /** YYYY-MM-DD of the inspection. */
  date: string;
  /** The inspection's highest current ratio (the worst test point); null when none could be computed. */
  ratio: number | null;
  /** The service threshold for the ratio in force on that date (manufacturer's if stricter); null if none. */
  serviceLimit: number | null;
};

export type TrendReason = 'rising' | 'over_half_limit';

export type TrendFlag = {
  worsening: boolean;
  reasons: TrendReason[];
  /** The ratios the rising test looked at, oldest first (at most three). */
  lastRatios: number[];
  latestRatio: number | null;
  latestLimit: number | null;
  /** Latest ratio as a fraction of its service limit (0.5 = half). */
  fractionOfLimit: number | null;
  message: string;
};

/** Inspections the rising test spans: three points make two consecutive rises. */
export const RISING_SPAN = 3;
/** Flag once the ratio is past this fraction of its service limit, well before it trips it. */
export const HALF_LIMIT_FRACTION = 0.5;

/**
 * Worsening when the ratio rose at each of the last three inspections that have one
 * (r1 < r2 < r3), or when the latest ratio is past half of the service limit in force on its date.
 */
export function ratioTrend(samples: readonly RatioSample[]): TrendFlag {
  const withRatio = [...samples].filter((s): s is RatioSample & { ratio: number } => s.ratio !== null).sort((a, b) => a.date.localeCompare(b.date));
  const last = withRatio.slice(-RISING_SPAN);
  const lastRatios = last.map((s) => s.ratio);
  const reasons: TrendReason[] = [];
  if (last.length === RISING_SPAN && last.every((s, i) => i === 0 || s.ratio > last[i - 1]!.ratio)) reasons.push('rising');

  const latest = withRatio.at(-1) ?? null;
  const latestLimit = latest?.serviceLimit ?? null;
  const fractionOfLimit = latest && latestLimit !== null && latestLimit > 0 ? latest.ratio / latestLimit : null;
  if (fractionOfLimit !== null && fractionOfLimit > HALF_LIMIT_FRACTION) reasons.push('over_half_limit');

  const parts: string[] = [];
  if (reasons.includes('rising')) parts.push(`the CO/CO2 ratio rose at each of the last ${RISING_SPAN} inspections (${lastRatios.map((r) => r.toFixed(4)).join(' → ')})`);
  if (reasons.includes('over_half_limit')) parts.push(`the latest ratio ${latest!.ratio.toFixed(4)} is ${Math.round(fractionOfLimit! * 100)} % of the service limit ${latestLimit}`);
  const message = parts.length
    ? `Getting worse: ${parts.join('; and ')}. Worth a closer look before it reaches the limit.`
    : withRatio.length === 0
      ? 'No ratio recorded yet.'
      : 'No worsening trend in the recorded ratios.';

  return { worsening: reasons.length > 0, reasons, lastRatios, latestRatio: latest?.ratio ?? null, latestLimit, fractionOfLimit, message };
}
