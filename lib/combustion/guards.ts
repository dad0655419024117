import { CombustionInputError, type CombustionInputField } from './errors';

// Values arrive from forms and JSON, so anything (strings, objects, symbols) may be smuggled in;
// describing it must never itself throw.
export function describeValue(value: unknown): string {
  if (typeof value === 'string') return JSON.stringify(value);
  if (typeof value === 'number' || typeof value === 'bigint' || typeof value === 'boolean') return String(value);
  if (value === null) return 'null';
  if (value === undefined) return 'nothing';
  if (typeof value === 'symbol') return 'a symbol';
  if (typeof value === 'function') return 'a function';
  return Array.isArray(value) ? 'an array' : 'an object';
}

function isFiniteNumber(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

export interface RangeRule {
  min: number;
  max: number;
  minExcluded?: boolean;
  maxExcluded?: boolean;
}

function rangeText(rule: RangeRule): string {
  const low = rule.minExcluded ? `above ${rule.min}` : `from ${rule.min}`;
  const high = rule.maxExcluded ? `below ${rule.max}` : `${rule.minExcluded ? 'at most ' : ''}${rule.max}`;
  const joiner = rule.minExcluded ? ' and ' : ' to ';
  return `${low}${joiner}${high}`;
}

/** Returns the value as a number if it is finite and inside the range, else throws naming the field. */
export function requireInRange(field: CombustionInputField, value: unknown, rule: RangeRule): number {
  const ok =
    isFiniteNumber(value) &&
    (rule.minExcluded ? value > rule.min : value >= rule.min) &&
    (rule.maxExcluded ? value < rule.max : value <= rule.max);
  if (!ok) {
    throw new CombustionInputError(
      field,
      `${field} must be a number ${rangeText(rule)} (got ${describeValue(value)})`,
    );
  }
  return value as number;
}

// One place for the ranges so every function rejects the same values the same way.
// CO cannot exceed 100 % of the sample.
export const CO_PPM_RANGE: RangeRule = { min: 0, max: 1_000_000 };
// 30 % is well above any fuel's CO2max; more means a unit mix-up or a broken sensor.
// Measured CO2 divides, so it has a floor below any analyser's resolution that keeps results finite.
export const CO2_PCT_RANGE: RangeRule = { min: 0.01, max: 30 };
export const CO2_MAX_PCT_RANGE: RangeRule = { min: 0, max: 30, minExcluded: true };
// At 20.9 % the sample is pure air and every air-free formula divides by zero.
export const O2_PCT_RANGE: RangeRule = { min: 0, max: 20.9, maxExcluded: true };
// Wide enough for outdoor air in a cold climate and any flue, narrow enough to catch typos and °F/°C mix-ups.
export const TEMP_C_RANGE: RangeRule = { min: -60, max: 1500 };
export const TEMP_F_RANGE: RangeRule = { min: -76, max: 2732 };
