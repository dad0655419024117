import { describe, expect, it } from 'vitest';
import { checkProfileVersion, checkRule, type LimitRule } from '../../../lib/limits';
import { rule, version } from './fixtures';

function fields(candidate: Partial<LimitRule>): string[] {
  return checkRule(candidate).map((e) => e.field);
}

describe('checkRule', () => {
  it('accepts a well-formed rule', () => {
    expect(checkRule(rule({ metric: 'co_co2_ratio', serviceAt: 0.008, dangerAt: 0.02, scope: { category: 'boiler', testPoint: 'high_fire' } }))).toEqual([]);
    expect(checkRule(rule({ metric: 'room_co_ppm', comparator: 'gte', serviceAt: 10, dangerAt: 30 }))).toEqual([]);
    expect(checkRule(rule({ metric: 'spillage', comparator: 'gte', dangerAt: 1 }))).toEqual([]);
    // gt 0 means "any drop at all trips it".
    expect(checkRule(rule({ metric: 'tightness_drop_mbar', comparator: 'gt', dangerAt: 0 }))).toEqual([]);
  });

  it('requires at least one threshold', () => {
    expect(fields(rule({ metric: 'co_air_free_ppm' }))).toEqual(['serviceAt']);
  });

  it('requires the danger level beyond the service level', () => {
    expect(fields(rule({ metric: 'co_air_free_ppm', serviceAt: 400, dangerAt: 400 }))).toEqual(['dangerAt']);
    expect(fields(rule({ metric: 'co_air_free_ppm', serviceAt: 400, dangerAt: 200 }))).toEqual(['dangerAt']);
  });

  it('requires positive finite thresholds', () => {
    expect(fields(rule({ metric: 'co_air_free_ppm', serviceAt: -5 }))).toEqual(['serviceAt']);
    expect(fields(rule({ metric: 'room_co_ppm', comparator: 'gte', serviceAt: 0 }))).toEqual(['serviceAt']);
    expect(fields(rule({ metric: 'co_air_free_ppm', dangerAt: Number.POSITIVE_INFINITY }))).toEqual(['dangerAt']);
  });

  it('rejects a ratio of 1 or more (a percentage typed as a ratio)', () => {
    const errors = checkRule(rule({ metric: 'co_co2_ratio', serviceAt: 0.8, dangerAt: 4 }));
    expect(errors).toEqual([{ field: 'dangerAt', message: expect.stringContaining('below 1') }]);
  });

  it('requires a source', () => {
    expect(fields(rule({ metric: 'co_air_free_ppm', dangerAt: 400, source: '   ' }))).toEqual(['source']);
  });

  it('rejects unknown names and a test point on a once-per-inspection metric', () => {
    const bad = { ...rule({ metric: 'room_co_ppm', serviceAt: 10, scope: { testPoint: 'high_fire' } }) };
    expect(fields(bad)).toEqual(['scope.testPoint']);
    expect(fields({ ...rule({ metric: 'co_air_free_ppm', dangerAt: 400 }), metric: 'co2' as never, comparator: 'lt' as never })).toEqual(['metric', 'comparator']);
    expect(fields({ ...rule({ metric: 'co_air_free_ppm', dangerAt: 400 }), scope: { category: 'kettle' as never, fuel: 'coal' as never, testPoint: null } })).toEqual([
      'scope.category',
      'scope.fuel',
    ]);
  });

  it('requires a spillage rule to trip on a fail and not on a pass', () => {
    expect(fields(rule({ metric: 'spillage', comparator: 'gt', dangerAt: 1 }))).toEqual(['dangerAt']);
  });
});

describe('checkProfileVersion', () => {
  it('checks its own fields, unique rule ids and each rule', () => {
    const a = rule({ id: 'same', metric: 'co_air_free_ppm', dangerAt: 400 });
    const b = rule({ id: 'same', metric: 'co_co2_ratio', serviceAt: 2 });
    const errors = checkProfileVersion({ ...version('', 0, '2024-13-01', [a, b]) });
    expect(errors.map((e) => e.field)).toEqual(['profileId', 'version', 'effectiveFrom', 'rules.1.id', 'rules.1.serviceAt']);
    expect(checkProfileVersion(version('town-code', 1, '2024-01-01', [a]))).toEqual([]);
  });
});
