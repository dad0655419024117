// Money as integer minor units (pence, cents) with an ISO 4217 currency. Pure: server and browser.
// Amounts never pass through floating-point arithmetic; typed amounts are parsed as text.

const digitsCache = new Map<string, number>();

/** How many minor-unit digits a currency has (GBP 2, JPY 0, KWD 3). */
export function minorDigits(currency: string): number {
  const code = currency.toUpperCase();
  let digits = digitsCache.get(code);
  if (digits === undefined) {
    digits = new Intl.NumberFormat('en-GB', { style: 'currency', currency: code }).resolvedOptions().maximumFractionDigits ?? 2;
    digitsCache.set(code, digits);
  }
  return digits;
}

/** "£1,234.50" from 123450 GBP. */
export function formatMoney(minor: number, currency: string): string {
  const digits = minorDigits(currency);
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase(), minimumFractionDigits: digits, maximumFractionDigits: digits }).format(minor / 10 ** digits);
}

/** "1234.50" from 123450 GBP: the plain form an input box shows. */
export function toMajorText(minor: number, currency: string): string {
  const digits = minorDigits(currency);
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(minor);
  if (digits === 0) return `${sign}${abs}`;
  const scale = 10 ** digits;
  return `${sign}${Math.floor(abs / scale)}.${String(abs % scale).padStart(digits, '0')}`;
}

/**
 * Parses what a person typed ("75", "75.5", "£1,075.50") into minor units; NaN when it is not an
 * amount or has more decimals than the currency allows. Never negative.
 */
export function parseMoneyInput(text: unknown, currency: string): number {
  if (typeof text === 'number') return Number.isFinite(text) ? parseMoneyInput(String(text), currency) : Number.NaN;
  if (typeof text !== 'string') return Number.NaN;
  const cleaned = text.trim().replace(/^[£$€]/, '').replace(/,/g, '').trim();
  const digits = minorDigits(currency);
  const match = /^(\d{1,9})(?:\.(\d*))?$/.exec(cleaned);
  if (!match) return Number.NaN;
  const fraction = match[2] ?? '';
  if (fraction.length > digits) return Number.NaN;
  return Number(match[1]) * 10 ** digits + Number(fraction.padEnd(digits, '0') || '0');
}

/** A tax rate in basis points (2000 = 20 %) shown as "20" or "17.5". */
export function formatRatePct(rateBp: number): string {
  const whole = Math.floor(rateBp / 100);
  const rest = rateBp % 100;
  return rest === 0 ? String(whole) : `${whole}.${String(rest).padStart(2, '0').replace(/0$/, '')}`;
}

/** "20", "17.5", "5.25" → basis points; NaN when not a percentage with at most two decimals. */
export function parseRatePct(text: unknown): number {
  const s = typeof text === 'number' ? String(text) : typeof text === 'string' ? text.trim().replace(/\s*%$/, '') : '';
  const match = /^(\d{1,3})(?:\.(\d{0,2}))?$/.exec(s);
  if (!match) return Number.NaN;
  return Number(match[1]) * 100 + Number((match[2] ?? '').padEnd(2, '0') || '0');
}
