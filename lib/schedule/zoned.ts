// Wall-clock times in the organisation's time zone <-> instants, with Intl only (no extra package).
// Pure; used by the booking handler and the board.

// Building an Intl.DateTimeFormat costs far more than formatting with one, and the board converts
// every visit of the week; one formatter per (purpose, time zone) is kept.
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(key: 'offset' | 'local', timeZone: string): Intl.DateTimeFormat {
  const id = `${key} ${timeZone}`;
  let f = formatters.get(id);
  if (!f) {
    f =
      key === 'offset'
        ? new Intl.DateTimeFormat('en-GB', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' })
        : new Intl.DateTimeFormat('en-CA', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit' });
    formatters.set(id, f);
  }
  return f;
}

function offsetMinutes(instant: Date, timeZone: string): number {
  const f = formatter('offset', timeZone);
  const p = Object.fromEntries(f.formatToParts(instant).map((x) => [x.type, x.value]));
  const asUtc = Date.UTC(Number(p.year), Number(p.month) - 1, Number(p.day), Number(p.hour), Number(p.minute), Number(p.second));
  return Math.round((asUtc - instant.getTime()) / 60000);
}

/** '2026-03-29' + '09:30' in Europe/London → the instant. Two passes settle DST edges. */
export function zonedToUtc(date: string, time: string, timeZone: string): Date {
  const [y, m, d] = date.split('-').map(Number);
  const [hh, mm] = time.split(':').map(Number);
  const naive = Date.UTC(y, m - 1, d, hh, mm);
  let guess = naive - offsetMinutes(new Date(naive), timeZone) * 60000;
  guess = naive - offsetMinutes(new Date(guess), timeZone) * 60000;
  return new Date(guess);
}

// formatToParts costs tens of microseconds; a board of thousands of visits repeats the same few
// hundred start times, so answers are kept per (time zone, instant), the cache emptied when large.
const zonedCache = new Map<string, { date: string; time: string }>();

/** The instant's date and HH:MM in the time zone. */
export function utcToZoned(instant: Date | string, timeZone: string): { date: string; time: string } {
  const t = typeof instant === 'string' ? new Date(instant) : instant;
  const key = `${timeZone} ${t.getTime()}`;
  const hit = zonedCache.get(key);
  if (hit) return { ...hit };
  const f = formatter('local', timeZone);
  const p = Object.fromEntries(f.formatToParts(t).map((x) => [x.type, x.value]));
  const out = { date: `${p.year}-${p.month}-${p.day}`, time: `${p.hour}:${p.minute}` };
  if (zonedCache.size >= 20_000) zonedCache.clear();
  zonedCache.set(key, out);
  return { ...out };
}

/** Monday of the week containing `date`. */
export function weekStart(date: string): string {
  const [y, m, d] = date.split('-').map(Number);
  const day = new Date(Date.UTC(y, m - 1, d)).getUTCDay();
  return new Date(Date.UTC(y, m - 1, d - ((day + 6) % 7))).toISOString().slice(0, 10);
}

export function shiftDate(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number);
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}
