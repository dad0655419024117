// Wall-clock ↔ instant conversion for bookings in the organisation's time zone (IANA tz data via Intl).
import { describe, expect, it } from 'vitest';
import { zonedToUtc, utcToZoned, weekStart } from '@/lib/schedule/zoned';

describe('zoned times', () => {
  it('London winter is UTC, summer is UTC+1', () => {
    expect(zonedToUtc('2026-12-02', '09:00', 'Europe/London').toISOString()).toBe('2026-12-02T09:00:00.000Z');
    expect(zonedToUtc('2026-07-02', '09:00', 'Europe/London').toISOString()).toBe('2026-07-02T08:00:00.000Z');
    expect(utcToZoned('2026-07-02T08:00:00.000Z', 'Europe/London')).toEqual({ date: '2026-07-02', time: '09:00' });
  });

  it('other zones round-trip', () => {
    const t = zonedToUtc('2026-03-08', '14:30', 'America/New_York');
    expect(t.toISOString()).toBe('2026-03-08T18:30:00.000Z');
    expect(utcToZoned(t, 'America/New_York')).toEqual({ date: '2026-03-08', time: '14:30' });
  });

  it('weeks start on Monday', () => {
    expect(weekStart('2026-12-02')).toBe('2026-11-30');
    expect(weekStart('2026-12-06')).toBe('2026-11-30');
    expect(weekStart('2026-11-30')).toBe('2026-11-30');
  });
});
