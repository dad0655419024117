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

interface LevelInForce {
  level: JurisdictionLevel;
  fromOrgDefault: boolean;
  inForce: ProfileVersion | null;
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

function toResolved(rule: LimitRule, version: ProfileVersion, level: LevelInForce): ResolvedRule {
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

function passed(rule: LimitRule, version: ProfileVersion, level: LevelInForce, reason: PassOverReason): PassedOverRule {
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

  for (const level of levels) {
    const version = level.inForce;
    if (version !== null) {
      const forMetric = version.rules.filter((rule) => rule.metric === metric);
      const inScope = forMetric.filter((rule) => scopeMatches(rule.scope, appliance, testPoint));

      if (decided !== null) {
        for (const rule of inScope) passedOver.push(passed(rule, version, level, 'less_local'));
      } else if (inScope.length > 0) {
        // Most specific wins; on a tie the first-defined rule wins (strict > keeps the earlier one).
        let winner = inScope[0]!;
        for (const rule of inScope) {
          if (scopeSpecificity(rule.scope) > scopeSpecificity(winner.scope)) winner = rule;
        }
        decided = toResolved(winner, version, level);
        const winnerSpecificity = scopeSpecificity(winner.scope);
        for (const rule of inScope) {
          if (rule === winner) continue;
          const reason = scopeSpecificity(rule.scope) < winnerSpecificity ? 'less_specific' : 'later_defined';
          passedOver.push(passed(rule, version, level, reason));
        }
      }

      if (includeOutOfScope) {
        for (const rule of forMetric) {
          if (!inScope.includes(rule)) passedOver.push(passed(rule, version, level, 'out_of_scope'));
        }
      }
    }

    for (const other of level.level.versions) {
      if (other === version) continue;
      for (const rule of other.rules) {
        if (rule.metric === metric && scopeMatches(rule.scope, appliance, testPoint)) {
          passedOver.push(passed(rule, other, level, 'not_in_force'));
        }
      }
    }
  }

  return { metric, testPoint, decided, passedOver };
}

/**
 * Which rule decides each metric (and test point) for one appliance on one date.
 * Levels are tried most local first, then the organisation default; the first level whose
 * version in force has an in-scope rule for the metric decides it, so a specific rule in a
 * parent never beats an any-scope rule in a more local level.
 */
export function resolveLimits(input: ResolveLimitsInput): ResolvedLimits {
  if (!isIsoDate(input.date)) {
    // A malformed date would silently pick the wrong version; refuse instead.
    throw new RangeError(`resolveLimits: date must be YYYY-MM-DD, got ${JSON.stringify(input.date)}`);
  }
  const levels: LevelInForce[] = [
    ...input.chain.map((level) => ({ level, fromOrgDefault: false })),
    ...(input.orgDefault ? [{ level: input.orgDefault, fromOrgDefault: true }] : []),
  ].map(({ level, fromOrgDefault }) => ({ level, fromOrgDefault, inForce: versionInForce(level.versions, input.date) }));

  const appliance: ApplianceKey = { category: input.appliance.category, fuel: input.appliance.fuel };
  const entries = limitSlots().map(({ metric, testPoint }) =>
    resolveSlot(levels, appliance, metric, testPoint, input.includeOutOfScope ?? false),
  );
  const resolvedLevels: ResolvedLevel[] = levels.map(({ level, fromOrgDefault, inForce }) => ({
    jurisdictionId: level.jurisdictionId,
    jurisdictionName: level.name,
    fromOrgDefault,
    profileId: inForce?.profileId ?? null,
    version: inForce?.version ?? null,
    effectiveFrom: inForce?.effectiveFrom ?? null,
  }));

  return { appliance, date: input.date, levels: resolvedLevels, entries };
}

/** The entry for a metric at a test point (pass null for room CO, spillage and tightness). */
export function findResolved(resolved: ResolvedLimits, metric: Metric, testPoint: TestPoint | null): ResolvedEntry | null {
  const slot = isReadingMetric(metric) ? testPoint : null;
  return resolved.entries.find((entry) => entry.metric === metric && entry.testPoint === slot) ?? null;
}
