// When a site's certificate runs out, and what the office should do about it.
// The period and the early-renewal window come from the site's jurisdiction; where the
// jurisdiction names no published source, the rule is "the configured policy".
import { addDays, addMonths, daysBetween, type IsoDate } from './dates';

export * from './dates';

export type RenewalPolicy = {
  /** Certificate period in whole months (e.g. 12). */
  periodMonths: number;
  /** A check this many days or fewer before expiry keeps the old anniversary. */
  earlyRenewalDays: number;
  /** Where the rule comes from; null means the organisation's configured policy. */
  source: string | null;
};

export function policySource(policy: RenewalPolicy): string {
  return policy.source?.trim() ? policy.source : 'Configured policy';
}

/**
 * Expiry after a check on `checkedOn`, given the expiry in force before it (if any).
 * Inside the early-renewal window (from expiry − window up to the expiry date itself) the new
 * certificate runs from the old expiry, so renewing early loses no time. Earlier than the window,
 * or after expiry, the new period runs from the check date.
 */
export function nextExpiry(input: { checkedOn: IsoDate; previousExpiry: IsoDate | null; policy: RenewalPolicy }): IsoDate {
  const { checkedOn, previousExpiry, policy } = input;
  if (previousExpiry && checkedOn <= previousExpiry && checkedOn >= addDays(previousExpiry, -policy.earlyRenewalDays)) {
    return addMonths(previousExpiry, policy.periodMonths);
  }
  return addMonths(checkedOn, policy.periodMonths);
}

/** Walks a site's certified checks in date order to the expiry in force now. */
export function expiryFromHistory(checks: IsoDate[], policy: RenewalPolicy): IsoDate | null {
  let expiry: IsoDate | null = null;
  for (const checkedOn of [...checks].sort()) expiry = nextExpiry({ checkedOn, previousExpiry: expiry, policy });
  return expiry;
}

export type RenewalState = 'none' | 'ok' | 'due_soon' | 'overdue';

/** Overdue once the expiry date has passed; due soon within `dueSoonDays` of it. */
export function renewalState(input: { expiresOn: IsoDate | null; today: IsoDate; dueSoonDays: number }): { state: RenewalState; daysLeft: number | null } {
  if (!input.expiresOn) return { state: 'none', daysLeft: null };
  const daysLeft = daysBetween(input.today, input.expiresOn);
  if (daysLeft < 0) return { state: 'overdue', daysLeft };
  if (daysLeft <= input.dueSoonDays) return { state: 'due_soon', daysLeft };
  return { state: 'ok', daysLeft };
}

/**
 * Which reminder offset (days before expiry) is due today, if any. Offsets are checked from the
 * largest down; once a smaller one is due it replaces the larger, so a site first seen late gets
 * one reminder rather than two at once. Nothing is due after the expiry date.
 */
export function dueReminderOffset(input: { expiresOn: IsoDate; today: IsoDate; offsetsDays: number[] }): number | null {
  const daysLeft = daysBetween(input.today, input.expiresOn);
  if (daysLeft < 0) return null;
  const due = input.offsetsDays.filter((o) => o >= daysLeft);
  return due.length ? Math.min(...due) : null;
}
