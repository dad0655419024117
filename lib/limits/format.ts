// Number formatting for verdict explanations: six significant digits, float noise trimmed.
// Kept apart from judge.ts so its fast path can be checked against the plain definition.

// 10^0 … 10^22 are exact doubles, so dividing by them is a single correctly rounded step.
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);

/** The plain definition: round to 6 significant digits, then print the shortest form. */
export function formatNumberReference(value: number): string {
  return String(Number(value.toPrecision(6)));
}

/**
 * Same output as formatNumberReference for every finite input, without toPrecision in the
 * common case (it is slow, and a verdict prints two figures per judged value). The value is
 * scaled so its six significant digits sit left of the point and rounded there; when the
 * scaled value is far from a .5 tie (well beyond the product's rounding error) that rounding
 * is the one toPrecision makes, and integer ÷ exact power of ten is the double the reference's
 * Number(...) would parse. Near a tie, or outside 1e-16 … 1e6, the reference decides.
 */
export function formatNumber(value: number): string {
  const magnitude = Math.abs(value);
  if (Number.isInteger(value) && magnitude < 1e6) return String(value);
  if (!(magnitude >= 1e-16 && magnitude < 1e6)) return formatNumberReference(value);
  let k = 5 - Math.floor(Math.log10(magnitude));
  let scaled = magnitude * POWERS_OF_TEN[k]!;
  // log10 can land one off next to a power of ten; bring the scaled value into [1e5, 1e6).
  if (scaled < 1e5 && k < 22) scaled = magnitude * POWERS_OF_TEN[++k]!;
  else if (scaled >= 1e6 && k > 0) scaled = magnitude * POWERS_OF_TEN[--k]!;
  if (scaled < 1e5 || scaled >= 1e6) return formatNumberReference(value);
  const fraction = scaled - Math.floor(scaled);
  if (Math.abs(fraction - 0.5) < 1e-6) return formatNumberReference(value);
  const rounded = Math.round(scaled) / POWERS_OF_TEN[k]!;
  return String(value < 0 ? -rounded : rounded);
}
