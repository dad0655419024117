import { isIsoDate } from './dates';
import {
  METRICS,
  TEST_POINTS,
  isReadingMetric,
  type ApplianceKey,
  type JurisdictionLevel,
  type LimitRule,
  type Metric,
  type PassOverReason,
  type PassedOverRule,
  type ProfileVersion,
  type ResolveLimitsInput,
  type ResolvedEntry,
  type ResolvedLevel,
  type ResolvedLimits,
  type ResolvedRule,
  type RuleScope,
  type TestPoint,
} from './types';

/** One profile version with its rules grouped by metric, so a slot never scans every rule. */
interface IndexedVersion {
  version: ProfileVersion;
  byMetric: ReadonlyMap<Metric, readonly LimitRule[]>;
}

/** One level of the chain, indexed once and reused for every slot, appliance and date. */
interface IndexedLevel {
  level: JurisdictionLevel;
  fromOrgDefault: boolean;
  versions: readonly IndexedVersion[];
}

interface LevelInForce {
  indexed: IndexedLevel;
  inForce: IndexedVersion | null;
}

const NO_RULES: readonly LimitRule[] = [];

function indexVersion(version: ProfileVersion): IndexedVersion {
  const byMetric = new Map<Metric, LimitRule[]>();
  for (const rule of version.rules) {
    const list = byMetric.get(rule.metric);
    if (list) list.push(rule);
    else byMetric.set(rule.metric, [rule]);
  }
  return { version, byMetric };
}

function indexLevels(chain: readonly JurisdictionLevel[], orgDefault: JurisdictionLevel | null): IndexedLevel[] {
  const levels = [
    ...chain.map((level) => ({ level, fromOrgDefault: false })),
    ...(orgDefault ? [{ level: orgDefault, fromOrgDefault: true }] : []),
  ];
  return levels.map(({ level, fromOrgDefault }) => ({ level, fromOrgDefault, versions: level.versions.map(indexVersion) }));
}

/**
 * The version in force on a date: greatest effectiveFrom not after the date; on equal
 * dates the higher version number, then the first listed. null when none has started yet.
 */
export function versionInForce(versions: readonly ProfileVersion[], date: string): ProfileVersion | null {
  let best: ProfileVersion | null = null;
  for (const candidate of versions) {
    if (candidate.effectiveFrom > date) continue;
    if (
      best === null ||
      candidate.effectiveFrom > best.effectiveFrom ||
      (candidate.effectiveFrom === best.effectiveFrom && candidate.version > best.version)
    ) {
      best = candidate;
    }
  }
  return best;
}

export function scopeSpecificity(scope: RuleScope): number {
  return (scope.category === null ? 0 : 1) + (scope.fuel === null ? 0 : 1) + (scope.testPoint === null ? 0 : 1);
}

/** A null scope field matches anything; a test point in the scope never matches a slot without one. */
export function scopeMatches(scope: RuleScope, appliance: ApplianceKey, testPoint: TestPoint | null): boolean {
  return (
    (scope.category === null || scope.category === appliance.category) &&
    (scope.fuel === null || scope.fuel === appliance.fuel) &&
    (scope.testPoint === null || scope.testPoint === testPoint)
  );
}

/** Every (metric, test point) pair a verdict can ask about, in a fixed order. */
export function limitSlots(): Array<{ metric: Metric; testPoint: TestPoint | null }> {
  const slots: Array<{ metric: Metric; testPoint: TestPoint | null }> = [];
  for (const metric of METRICS) {
    if (isReadingMetric(metric)) {
      for (const testPoint of TEST_POINTS) slots.push({ metric, testPoint });
    } else {
      slots.push({ metric, testPoint: null });
    }
  }
  return slots;
}

function toResolved(rule: LimitRule, version: ProfileVersion, level: IndexedLevel): ResolvedRule {
  // Copied field by field so the result is plain JSON and never aliases the caller's objects.
  return {
    ruleId: rule.id,
    metric: rule.metric,
    scope: { category: rule.scope.category, fuel: rule.scope.fuel, testPoint: rule.scope.testPoint },
    comparator: rule.comparator,
    serviceAt: rule.serviceAt,
    dangerAt: rule.dangerAt,
    source: rule.source,
    note: rule.note ?? null,
    jurisdictionId: level.level.jurisdictionId,
    jurisdictionName: level.level.name,
    profileName: level.level.profileName ?? null,
    profileId: version.profileId,
    version: version.version,
    effectiveFrom: version.effectiveFrom,
    fromOrgDefault: level.fromOrgDefault,
    specificity: scopeSpecificity(rule.scope),
  };
}

function passed(rule: LimitRule, version: ProfileVersion, level: IndexedLevel, reason: PassOverReason): PassedOverRule {
  return { ...toResolved(rule, version, level), reason };
}

function resolveSlot(
  levels: readonly LevelInForce[],
  appliance: ApplianceKey,
  metric: Metric,
  testPoint: TestPoint | null,
  includeOutOfScope: boolean,
): ResolvedEntry {
  let decided: ResolvedRule | null = null;
  const passedOver: PassedOverRule[] = [];

  for (const { indexed, inForce } of levels) {
    if (inForce !== null) {
      const version = inForce.version;
      const forMetric = inForce.byMetric.get(metric) ?? NO_RULES;
      const inScope = forMetric.filter((rule) => scopeMatches(rule.scope, appliance, testPoint));

      if (decided !== null) {
        for (const rule of inScope) passedOver.push(passed(rule, version, indexed, 'less_local'));
      } else if (inScope.length > 0) {
        // Most specific wins; on a tie the first-defined rule wins (strict > keeps the earlier one).
        let winner = inScope[0]!;
        for (const rule of inScope) {
          if (scopeSpecificity(rule.scope) > scopeSpecificity(winner.scope)) winner = rule;
        }
        decided = toResolved(winner, version, indexed);
        const winnerSpecificity = scopeSpecificity(winner.scope);
        for (const rule of inScope) {
          if (rule === winner) continue;
          const reason = scopeSpecificity(rule.scope) < winnerSpecificity ? 'less_specific' : 'later_defined';
          passedOver.push(passed(rule, version, indexed, reason));
        }
      }

      if (includeOutOfScope) {
        for (const rule of forMetric) {
          if (!inScope.includes(rule)) passedOver.push(passed(rule, version, indexed, 'out_of_scope'));
        }
      }
    }

    for (const other of indexed.versions) {
      // Compared by the caller's version object, so a version listed twice is skipped twice as before.
      if (other.version === inForce?.version) continue;
      for (const rule of other.byMetric.get(metric) ?? NO_RULES) {
        if (scopeMatches(rule.scope, appliance, testPoint)) {
          passedOver.push(passed(rule, other.version, indexed, 'not_in_force'));
        }
      }
    }
  }

  return { metric, testPoint, decided, passedOver };
}

function checkDate(date: string): void {
  if (!isIsoDate(date)) {
    // A malformed date would silently pick the wrong version; refuse instead.
    throw new RangeError(`resolveLimits: date must be YYYY-MM-DD, got ${JSON.stringify(date)}`);
  }
}

/** The version in force on a date for an indexed level (same rule as versionInForce). */
function indexedInForce(indexed: IndexedLevel, date: string): IndexedVersion | null {
  const chosen = versionInForce(indexed.level.versions, date);
  return chosen === null ? null : (indexed.versions.find((v) => v.version === chosen) ?? null);
}

function resolveIndexed(indexedLevels: readonly IndexedLevel[], applianceIn: ApplianceKey, date: string, includeOutOfScope: boolean): ResolvedLimits {
  const levels: LevelInForce[] = indexedLevels.map((indexed) => ({ indexed, inForce: indexedInForce(indexed, date) }));
  const appliance: ApplianceKey = { category: applianceIn.category, fuel: applianceIn.fuel };
  const entries = SLOTS.map(({ metric, testPoint }) => resolveSlot(levels, appliance, metric, testPoint, includeOutOfScope));
  const resolvedLevels: ResolvedLevel[] = levels.map(({ indexed, inForce }) => ({
    jurisdictionId: indexed.level.jurisdictionId,
    jurisdictionName: indexed.level.name,
    fromOrgDefault: indexed.fromOrgDefault,
    profileId: inForce?.version.profileId ?? null,
    version: inForce?.version.version ?? null,
    effectiveFrom: inForce?.version.effectiveFrom ?? null,
  }));

  return { appliance, date, levels: resolvedLevels, entries };
}

const SLOTS = limitSlots();

/**
 * Which rule decides each metric (and test point) for one appliance on one date.
 * Levels are tried most local first, then the organisation default; the first level whose
 * version in force has an in-scope rule for the metric decides it, so a specific rule in a
 * parent never beats an any-scope rule in a more local level.
 */
export function resolveLimits(input: ResolveLimitsInput): ResolvedLimits {
  checkDate(input.date);
  return resolveIndexed(indexLevels(input.chain, input.orgDefault), input.appliance, input.date, input.includeOutOfScope ?? false);
}

export interface LimitResolver {
  /** Same answer as resolveLimits with this resolver's chain; repeated keys return the same frozen object. */
  resolve(appliance: ApplianceKey, date: string, options?: { includeOutOfScope?: boolean }): ResolvedLimits;
  /** Distinct (category, fuel, date, out-of-scope) answers held. */
  readonly size: number;
}

// Enough for every category and fuel over several years of dates; past it the cache starts
// afresh rather than growing without bound during a long import.
const RESOLVER_CACHE_LIMIT = 10_000;

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const child of Object.values(value)) deepFreeze(child);
  }
  return value;
}

/**
 * Resolution for many appliances under one jurisdiction chain (a bulk import, a day's
 * submissions, a scale benchmark). The chain is indexed by metric once, and each answer is
 * memoised per (category, fuel, date, includeOutOfScope): a thousand gas boilers judged on the
 * same day resolve once. The resolver reads the chain as it is when created; build a new one
 * when profiles change. Answers are deep-frozen because every caller with the same key shares
 * one object.
 */
export function createLimitResolver(input: { chain: readonly JurisdictionLevel[]; orgDefault: JurisdictionLevel | null }): LimitResolver {
  const indexed = indexLevels(input.chain, input.orgDefault);
  // date → category → fuel → [without, with out-of-scope rules]. Nested rather than one joined
  // key, so a hit (nearly every call in a bulk run) builds no string.
  const cache = new Map<string, Map<string, Map<string, [ResolvedLimits | undefined, ResolvedLimits | undefined]>>>();
  let size = 0;
  return {
    resolve(appliance, date, options) {
      const includeOutOfScope = options?.includeOutOfScope ?? false;
      const slot = includeOutOfScope ? 1 : 0;
      const hit = cache.get(date)?.get(appliance.category)?.get(appliance.fuel)?.[slot];
      if (hit !== undefined) return hit;
      checkDate(date);
      if (size >= RESOLVER_CACHE_LIMIT) {
        cache.clear();
        size = 0;
      }
      const resolved = deepFreeze(resolveIndexed(indexed, appliance, date, includeOutOfScope));
      let byCategory = cache.get(date);
      if (byCategory === undefined) cache.set(date, (byCategory = new Map()));
      let byFuel = byCategory.get(appliance.category);
      if (byFuel === undefined) byCategory.set(appliance.category, (byFuel = new Map()));
      let pair = byFuel.get(appliance.fuel);
      if (pair === undefined) byFuel.set(appliance.fuel, (pair = [undefined, undefined]));
      pair[slot] = resolved;
      size++;
      return resolved;
    },
    get size() {
      return size;
    },
  };
}

/** The entry for a metric at a test point (pass null for room CO, spillage and tightness). */
export function findResolved(resolved: ResolvedLimits, metric: Metric, testPoint: TestPoint | null): ResolvedEntry | null {
  const slot = isReadingMetric(metric) ? testPoint : null;
  // Entries come in limitSlots() order, so look there first; a payload reordered on its way
  // through JSON or storage still gets the right entry from the scan.
  const expected = resolved.entries[SLOT_INDEX[metric][slot ?? 'none']];
  if (expected !== undefined && expected.metric === metric && expected.testPoint === slot) return expected;
  return resolved.entries.find((entry) => entry.metric === metric && entry.testPoint === slot) ?? null;
}

/** Position of each (metric, test point) in limitSlots(); -1 where a metric has no such slot. */
const SLOT_INDEX = Object.fromEntries(
  METRICS.map((metric) => [
    metric,
    Object.fromEntries([...TEST_POINTS, 'none' as const].map((point) => [
      point,
      SLOTS.findIndex((slot) => slot.metric === metric && slot.testPoint === (point === 'none' ? null : point)),
    ])),
  ]),
) as Record<Metric, Record<TestPoint | 'none', number>>;
