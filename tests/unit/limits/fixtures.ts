// Builders for limit-rule tests: invented jurisdictions ("Nation", "Region", "Town") and readings.
// Edit when the rule or figures shapes change.
import type {
  ApplianceKey,
  FiguresAtTestPoint,
  JurisdictionLevel,
  LimitRule,
  ProfileVersion,
  RuleScope,
} from '../../../lib/limits';

let counter = 0;

export function rule(partial: Partial<Omit<LimitRule, 'scope'>> & Pick<LimitRule, 'metric'> & { scope?: Partial<RuleScope> }): LimitRule {
  counter += 1;
  return {
    id: partial.id ?? `rule-${counter}`,
    metric: partial.metric,
    scope: { category: null, fuel: null, testPoint: null, ...partial.scope },
    comparator: partial.comparator ?? 'gt',
    serviceAt: partial.serviceAt === undefined ? null : partial.serviceAt,
    dangerAt: partial.dangerAt === undefined ? null : partial.dangerAt,
    source: partial.source ?? 'Test source',
    note: partial.note ?? null,
  };
}

export function version(profileId: string, versionNumber: number, effectiveFrom: string, rules: LimitRule[]): ProfileVersion {
  return { profileId, version: versionNumber, effectiveFrom, rules };
}

export function level(jurisdictionId: string, name: string, versions: ProfileVersion[]): JurisdictionLevel {
  return { jurisdictionId, name, versions };
}

/** A level with one version in force since 2000. */
export function simpleLevel(jurisdictionId: string, name: string, rules: LimitRule[]): JurisdictionLevel {
  return level(jurisdictionId, name, [version(`${jurisdictionId}-code`, 1, '2000-01-01', rules)]);
}

export const NG_BOILER: ApplianceKey = { category: 'boiler', fuel: 'natural-gas' };

export function figures(partial: Partial<FiguresAtTestPoint> = {}): FiguresAtTestPoint {
  return {
    testPoint: 'high_fire',
    coPpm: 10,
    ratio: null,
    coAirFreeFromO2Ppm: null,
    coAirFreeFromCo2Ppm: null,
    flueLossPct: null,
    ...partial,
  };
}
