import { isIsoDate } from './dates';
import { trips } from './levels';
import {
  APPLIANCE_CATEGORIES,
  COMPARATORS,
  FUEL_IDS,
  METRICS,
  TEST_POINTS,
  isReadingMetric,
  type LimitRule,
  type Metric,
  type ProfileVersion,
} from './types';

/** One problem with one field; `field` is a dotted path ("scope.fuel", "rules.2.dangerAt"). */
export interface RuleFieldError {
  field: string;
  message: string;
}

function isOneOf<T extends string>(list: readonly T[], value: unknown): value is T {
  return typeof value === 'string' && (list as readonly string[]).includes(value);
}

function checkThreshold(field: 'serviceAt' | 'dangerAt', value: unknown, rule: Partial<LimitRule>, errors: RuleFieldError[]): value is number {
  if (value === null || value === undefined) return false;
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    errors.push({ field, message: 'must be a number' });
    return false;
  }
  // Zero is meaningful only as "any amount trips" (gt 0); at-or-above 0 would trip on every value.
  if (value < 0 || (value === 0 && rule.comparator !== 'gt')) {
    errors.push({ field, message: 'must be greater than zero' });
    return false;
  }
  if (rule.metric === 'co_co2_ratio' && value >= 1) {
    // Catches a percentage typed where a ratio belongs (0.4 % is 0.004, and no real ratio reaches 1).
    errors.push({ field, message: 'a CO/CO2 ratio must be below 1 (write 0.004, not 0.4 %)' });
    return false;
  }
  if (rule.metric === 'flue_loss_pct' && value >= 100) {
    errors.push({ field, message: 'a flue loss must be below 100 %' });
    return false;
  }
  return true;
}

/**
 * Field errors for one limit rule, empty when it is usable. Framework-free so a form
 * schema, the API handler and an import script can all call it.
 */
export function checkRule(rule: Partial<LimitRule> | null | undefined): RuleFieldError[] {
  const errors: RuleFieldError[] = [];
  if (typeof rule !== 'object' || rule === null) return [{ field: '', message: 'must be a limit rule' }];

  if (rule.id !== undefined && (typeof rule.id !== 'string' || rule.id.trim() === '')) {
    errors.push({ field: 'id', message: 'must be a non-empty string' });
  }
  const metricOk = isOneOf<Metric>(METRICS, rule.metric);
  if (!metricOk) errors.push({ field: 'metric', message: `must be one of ${METRICS.join(', ')}` });
  const comparatorOk = isOneOf(COMPARATORS, rule.comparator);
  if (!comparatorOk) errors.push({ field: 'comparator', message: "must be 'gt' or 'gte'" });

  const scope = rule.scope;
  if (typeof scope !== 'object' || scope === null) {
    errors.push({ field: 'scope', message: 'is required (use null fields for "any")' });
  } else {
    if (scope.category !== null && !isOneOf(APPLIANCE_CATEGORIES, scope.category)) {
      errors.push({ field: 'scope.category', message: 'must be an appliance category or null' });
    }
    if (scope.fuel !== null && !isOneOf(FUEL_IDS, scope.fuel)) {
      errors.push({ field: 'scope.fuel', message: 'must be a fuel or null' });
    }
    if (scope.testPoint !== null && !isOneOf(TEST_POINTS, scope.testPoint)) {
      errors.push({ field: 'scope.testPoint', message: 'must be a test point or null' });
    } else if (scope.testPoint !== null && metricOk && !isReadingMetric(rule.metric as Metric)) {
      // Such a rule could never apply: these metrics are judged once, not per reading.
      errors.push({ field: 'scope.testPoint', message: 'must be null for room CO, spillage and tightness' });
    }
  }

  const hasService = checkThreshold('serviceAt', rule.serviceAt, rule, errors);
  const hasDanger = checkThreshold('dangerAt', rule.dangerAt, rule, errors);
  if ((rule.serviceAt === null || rule.serviceAt === undefined) && (rule.dangerAt === null || rule.dangerAt === undefined)) {
    errors.push({ field: 'serviceAt', message: 'give a service level, a danger level or both' });
  }
  if (hasService && hasDanger && (rule.dangerAt as number) <= (rule.serviceAt as number)) {
    errors.push({ field: 'dangerAt', message: 'must be above the service level' });
  }
  if (rule.metric === 'spillage' && comparatorOk) {
    // Spillage is recorded as 1 = fail, 0 = pass: each level given must trip on a fail and not on a pass.
    for (const field of ['serviceAt', 'dangerAt'] as const) {
      const value = rule[field];
      if (typeof value === 'number' && Number.isFinite(value) && (!trips(1, value, rule.comparator!) || trips(0, value, rule.comparator!))) {
        errors.push({ field, message: "for spillage use 'gte' 1 (a fail trips it, a pass does not)" });
      }
    }
  }

  if (typeof rule.source !== 'string' || rule.source.trim() === '') {
    errors.push({ field: 'source', message: 'name the published source of the figure' });
  }
  if (rule.note !== undefined && rule.note !== null && typeof rule.note !== 'string') {
    errors.push({ field: 'note', message: 'must be text or empty' });
  }
  return errors;
}

/** Field errors for a whole profile version: its own fields, unique rule ids, then every rule. */
export function checkProfileVersion(version: Partial<ProfileVersion> | null | undefined): RuleFieldError[] {
  if (typeof version !== 'object' || version === null) return [{ field: '', message: 'must be a profile version' }];
  const errors: RuleFieldError[] = [];
  if (typeof version.profileId !== 'string' || version.profileId.trim() === '') {
    errors.push({ field: 'profileId', message: 'must be a non-empty string' });
  }
  if (typeof version.version !== 'number' || !Number.isInteger(version.version) || version.version < 1) {
    errors.push({ field: 'version', message: 'must be a whole number from 1' });
  }
  if (!isIsoDate(version.effectiveFrom)) {
    errors.push({ field: 'effectiveFrom', message: 'must be a date written YYYY-MM-DD' });
  }
  if (!Array.isArray(version.rules)) {
    errors.push({ field: 'rules', message: 'must be a list of rules' });
    return errors;
  }
  const seen = new Set<string>();
  version.rules.forEach((rule, index) => {
    if (typeof rule?.id !== 'string' || rule.id.trim() === '') {
      errors.push({ field: `rules.${index}.id`, message: 'must be a non-empty string' });
    } else if (seen.has(rule.id)) {
      errors.push({ field: `rules.${index}.id`, message: 'is used by an earlier rule' });
    } else {
      seen.add(rule.id);
    }
    for (const error of checkRule(rule)) {
      if (error.field !== 'id') errors.push({ field: `rules.${index}${error.field ? `.${error.field}` : ''}`, message: error.message });
    }
  });
  return errors;
}
