// Calendar-date arithmetic on 'YYYY-MM-DD' strings, free of time zones: a certificate expires on a
// date, not at an instant. Pure; runs in the browser and on the server alike.

export type IsoDate = string;

function parts(date: IsoDate): [number, number, number] {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) throw new RangeError(`not a date: ${date}`);
  return [Number(m[1]), Number(m[2]), Number(m[3])];
}

function format(y: number, m: number, d: number): IsoDate {
  return `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;
}

export function daysInMonth(year: number, month1: number): number {
  return new Date(Date.UTC(year, month1, 0)).getUTCDate();
}

/**
 * Adds whole months; a day that does not exist in the target month becomes that month's last day
 * (31 Jan + 1 month = 28 or 29 Feb; 29 Feb + 12 months = 28 Feb).
 */
export function addMonths(date: IsoDate, months: number): IsoDate {
  const [y, m, d] = parts(date);
  const index = y * 12 + (m - 1) + months;
  const ty = Math.floor(index / 12);
  const tm = (index % 12) + 1;
  return format(ty, tm, Math.min(d, daysInMonth(ty, tm)));
}

export function addDays(date: IsoDate, days: number): IsoDate {
  const [y, m, d] = parts(date);
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

/** b − a in whole days. */
export function daysBetween(a: IsoDate, b: IsoDate): number {
  const [ay, am, ad] = parts(a);
  const [by, bm, bd] = parts(b);
  return Math.round((Date.UTC(by, bm - 1, bd) - Date.UTC(ay, am - 1, ad)) / 86400_000);
}

/** The calendar date of an instant in a time zone (e.g. the organisation's). */
export function dateInZone(instant: Date, timeZone: string): IsoDate {
  return dateFormatter(timeZone).format(instant);
}

// Building an Intl.DateTimeFormat costs far more than formatting with one, and the renewals list
// formats one date per certified visit; one formatter per time zone is kept (a handful at most).
const dateFormatters = new Map<string, Intl.DateTimeFormat>();

function dateFormatter(timeZone: string): Intl.DateTimeFormat {
  let f = dateFormatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    dateFormatters.set(timeZone, f);
  }
  return f;
}
