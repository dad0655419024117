import type { Comparator, VerdictLevel } from './types';

/** Least to most severe. An unknown ranks above clear so a metric nobody could judge never passes silently. */
export const VERDICT_ORDER: readonly VerdictLevel[] = ['clear', 'unknown', 'service', 'danger'];

export function verdictRank(level: VerdictLevel): number {
  return VERDICT_ORDER.indexOf(level);
}

/** The most severe level; an empty list is 'unknown' because nothing judged is not the same as all clear. */
export function worstLevel(levels: readonly VerdictLevel[]): VerdictLevel {
  if (levels.length === 0) return 'unknown';
  let worst: VerdictLevel = 'clear';
  for (const level of levels) {
    if (verdictRank(level) > verdictRank(worst)) worst = level;
  }
  return worst;
}

// Derived figures carry floating-point noise (0.008 can arrive as 0.008000000000000002);
// a difference this small relative to the threshold is treated as "exactly at" it.
const RELATIVE_TOLERANCE = 1e-9;

/**
 * Whether a value trips a threshold. `gt`: strictly above trips, exactly at is within
 * ("shall not exceed"). `gte`: at or above trips ("10 ppm or more").
 */
export function trips(value: number, threshold: number, comparator: Comparator): boolean {
  const tolerance = Math.abs(threshold) * RELATIVE_TOLERANCE;
  return comparator === 'gt' ? value > threshold + tolerance : value >= threshold - tolerance;
}
