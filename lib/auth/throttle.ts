// Sign-in throttling policy: 5 failed attempts per account and address in 15 minutes.
export const THROTTLE_MAX_FAILURES = 5;
export const THROTTLE_WINDOW_MS = 15 * 60_000;

export function throttleMessage(minutes: number): string {
  return `Too many failed sign-ins for this account from this address. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`;
}

export const WRONG_CREDENTIALS_MESSAGE = 'That e-mail and password do not match an active staff account.';

/** Minutes until the oldest failure in the window falls out of it (at least 1). */
export function minutesUntilRetry(oldestFailureIso: string | null, nowMs: number): number {
  if (!oldestFailureIso) return Math.ceil(THROTTLE_WINDOW_MS / 60_000);
  const freeAt = new Date(oldestFailureIso).getTime() + THROTTLE_WINDOW_MS;
  return Math.max(1, Math.ceil((freeAt - nowMs) / 60_000));
}
