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
  const digits = Math.round(scaled);
  if (digits < 1e6 && magnitude >= 1e-6) return placePoint(digits, k, value < 0);
  const rounded = digits / POWERS_OF_TEN[k]!;
  return String(value < 0 ? -rounded : rounded);
}

/**
 * digits × 10^-k written out, for six digits and 0 ≤ k ≤ 11 (values from 1e-6 up to 1e6, which
 * JavaScript prints without an exponent). The double nearest that decimal is what the reference
 * prints, and the decimal itself is its shortest round-trip form: any other decimal of six
 * digits or fewer lies a millionth away, far beyond one unit in the last place. So the digits are
 * placed by hand rather than converting a double back to text, which is the slow step.
 */
function placePoint(digits: number, k: number, negative: boolean): string {
  let text = String(digits);
  let end = text.length;
  while (end > 0 && text.charCodeAt(end - 1) === 48) end--; // trailing zeros of the fraction
  const pointAt = text.length - k;
  if (pointAt >= end) text = text.slice(0, pointAt);
  else if (pointAt > 0) text = `${text.slice(0, pointAt)}.${text.slice(pointAt, end)}`;
  else text = `0.${ZEROS.slice(0, -pointAt)}${text.slice(0, end)}`;
  return negative ? `-${text}` : text;
}

const ZEROS = '00000000000';
