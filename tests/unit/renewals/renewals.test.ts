// Renewal arithmetic. The period and early-renewal window are the configured policy of a
// jurisdiction (columns certificate_period_months / early_renewal_days); the numbers here are
// example policies, not a published rule.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { addMonths, addDays, daysBetween, nextExpiry, expiryFromHistory, renewalState, dueReminderOffset, policySource, type RenewalPolicy } from '@/lib/renewals';

const twelveMonths: RenewalPolicy = { periodMonths: 12, earlyRenewalDays: 61, source: null };

describe('addMonths', () => {
  it.each([
    ['2026-01-31', 1, '2026-02-28'],
    ['2028-01-31', 1, '2028-02-29'],
    ['2026-03-31', 1, '2026-04-30'],
    ['2024-02-29', 12, '2025-02-28'],
    ['2024-02-29', 48, '2028-02-29'],
    ['2026-12-15', 1, '2027-01-15'],
    ['2026-05-31', -3, '2026-02-28'],
  ])('%s + %i months = %s (month end clamps)', (from, n, expected) => {
    expect(addMonths(from, n)).toBe(expected);
  });

  it('never produces an invalid date and keeps the day when it exists', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2000, max: 2100 }), fc.integer({ min: 1, max: 12 }), fc.integer({ min: 1, max: 28 }), fc.integer({ min: -60, max: 60 }), (y, m, d, n) => {
        const date = `${y}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;
        const out = addMonths(date, n);
        expect(Number.isNaN(Date.parse(out))).toBe(false);
        expect(out.slice(8)).toBe(String(d).padStart(2, '0'));
      }),
    );
  });
});

describe('nextExpiry — period and early-renewal window (configured policy)', () => {
  it('first check: one period from the check date', () => {
    expect(nextExpiry({ checkedOn: '2026-03-10', previousExpiry: null, policy: twelveMonths })).toBe('2027-03-10');
  });

  it('a check inside the window keeps the old anniversary', () => {
    expect(nextExpiry({ checkedOn: '2027-01-20', previousExpiry: '2027-03-10', policy: twelveMonths })).toBe('2028-03-10');
  });

  it('the window edges: exactly window days early keeps it, one day more does not', () => {
    const previousExpiry = '2027-03-10';
    const edge = addDays(previousExpiry, -61);
    expect(nextExpiry({ checkedOn: edge, previousExpiry, policy: twelveMonths })).toBe('2028-03-10');
    const before = addDays(previousExpiry, -62);
    expect(nextExpiry({ checkedOn: before, previousExpiry, policy: twelveMonths })).toBe(addMonths(before, 12));
  });

  it('on the expiry day still keeps the anniversary; after it, a new one starts', () => {
    expect(nextExpiry({ checkedOn: '2027-03-10', previousExpiry: '2027-03-10', policy: twelveMonths })).toBe('2028-03-10');
    expect(nextExpiry({ checkedOn: '2027-03-25', previousExpiry: '2027-03-10', policy: twelveMonths })).toBe('2028-03-25');
  });

  it('a 29 February anniversary moves to 28 February and stays there', () => {
    const history = ['2024-02-29', '2025-02-01', '2026-02-10'];
    expect(expiryFromHistory(history, twelveMonths)).toBe('2027-02-28');
  });

  it('other periods: a 24-month policy with a 30-day window', () => {
    const p: RenewalPolicy = { periodMonths: 24, earlyRenewalDays: 30, source: 'Borough bylaw 12' };
    expect(expiryFromHistory(['2026-01-31'], p)).toBe('2028-01-31');
    expect(expiryFromHistory(['2026-01-31', '2028-01-05'], p)).toBe('2030-01-31');
    expect(expiryFromHistory(['2026-01-31', '2027-12-01'], p)).toBe('2029-12-01');
    expect(policySource(p)).toBe('Borough bylaw 12');
    expect(policySource(twelveMonths)).toBe('Configured policy');
  });

  it('history order does not matter', () => {
    expect(expiryFromHistory(['2026-02-10', '2024-02-29', '2025-02-01'], twelveMonths)).toBe('2027-02-28');
    expect(expiryFromHistory([], twelveMonths)).toBeNull();
  });
});

describe('renewalState and reminder offsets', () => {
  it('overdue after the expiry date, due soon within the window, ok before', () => {
    expect(renewalState({ expiresOn: '2026-12-01', today: '2026-12-02', dueSoonDays: 60 })).toEqual({ state: 'overdue', daysLeft: -1 });
    expect(renewalState({ expiresOn: '2026-12-01', today: '2026-12-01', dueSoonDays: 60 })).toEqual({ state: 'due_soon', daysLeft: 0 });
    expect(renewalState({ expiresOn: '2027-01-31', today: '2026-12-02', dueSoonDays: 60 })).toEqual({ state: 'due_soon', daysLeft: 60 });
    expect(renewalState({ expiresOn: '2027-02-01', today: '2026-12-02', dueSoonDays: 60 })).toEqual({ state: 'ok', daysLeft: 61 });
    expect(renewalState({ expiresOn: null, today: '2026-12-02', dueSoonDays: 60 }).state).toBe('none');
  });

  it('the nearest due offset wins; nothing before the first or after expiry', () => {
    const offsetsDays = [60, 30];
    expect(dueReminderOffset({ expiresOn: '2027-03-01', today: addDays('2027-03-01', -61), offsetsDays })).toBeNull();
    expect(dueReminderOffset({ expiresOn: '2027-03-01', today: addDays('2027-03-01', -60), offsetsDays })).toBe(60);
    expect(dueReminderOffset({ expiresOn: '2027-03-01', today: addDays('2027-03-01', -31), offsetsDays })).toBe(60);
    expect(dueReminderOffset({ expiresOn: '2027-03-01', today: addDays('2027-03-01', -30), offsetsDays })).toBe(30);
    expect(dueReminderOffset({ expiresOn: '2027-03-01', today: '2027-03-01', offsetsDays })).toBe(30);
    expect(dueReminderOffset({ expiresOn: '2027-03-01', today: '2027-03-02', offsetsDays })).toBeNull();
  });

  it('daysBetween crosses month ends and leap days', () => {
    expect(daysBetween('2028-02-28', '2028-03-01')).toBe(2);
    expect(daysBetween('2027-02-28', '2027-03-01')).toBe(1);
  });
});
