import 'server-only';
// Helpers that make rows read the same on SQLite and PostgreSQL (dates, booleans, numbers).

export function toIso(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  if (value instanceof Date) return value.toISOString();
  const s = String(value);
  // SQLite's CURRENT_TIMESTAMP default is "YYYY-MM-DD HH:MM:SS" in UTC.
  if (/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}$/.test(s)) return `${s.replace(' ', 'T')}.000Z`;
  return new Date(s).toISOString();
}

export function toDateOnly(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  if (value instanceof Date) return value.toISOString().slice(0, 10);
  return String(value).slice(0, 10);
}

export function toBool(value: unknown): boolean {
  return value === true || value === 1 || value === '1' || value === 't';
}

export function toNum(value: unknown): number | null {
  if (value === null || value === undefined) return null;
  const n = Number(value);
  return Number.isFinite(n) ? n : null;
}

export function nowIso(): string {
  return new Date().toISOString();
}
