import { describe, expect, it } from 'vitest';
import { createLimitResolver, findResolved, judge, resolveLimits, versionInForce, type ResolvedLimits } from '../../../lib/limits';
import { NG_BOILER, figures, level, rule, simpleLevel, version } from './fixtures';

describe('resolveLimits: precedence between levels', () => {
  const town = simpleLevel('town', 'Town', [rule({ id: 'town-ratio', metric: 'co_co2_ratio', serviceAt: 0.006 })]);
  const region = simpleLevel('region', 'Region', [
    rule({ id: 'region-ratio', metric: 'co_co2_ratio', serviceAt: 0.007 }),
    rule({ id: 'region-af', metric: 'co_air_free_ppm', serviceAt: 100, dangerAt: 400 }),
  ]);
  const nation = simpleLevel('nation', 'Nation', [
    rule({ id: 'nation-ratio', metric: 'co_co2_ratio', serviceAt: 0.008 }),
    rule({ id: 'nation-af', metric: 'co_air_free_ppm', serviceAt: 200, dangerAt: 800 }),
    rule({ id: 'nation-room', metric: 'room_co_ppm', comparator: 'gte', serviceAt: 10, dangerAt: 30 }),
  ]);
  const org = simpleLevel('org', 'Org defaults', [
    rule({ id: 'org-ratio', metric: 'co_co2_ratio', serviceAt: 0.01 }),
    rule({ id: 'org-loss', metric: 'flue_loss_pct', serviceAt: 11 }),
  ]);
  const resolved = resolveLimits({ chain: [town, region, nation], orgDefault: org, appliance: NG_BOILER, date: '2024-03-01' });

  it('lets the most local level decide and lists the others as less local, in chain order', () => {
    const entry = findResolved(resolved, 'co_co2_ratio', 'high_fire')!;
    expect(entry.decided).toMatchObject({ ruleId: 'town-ratio', jurisdictionId: 'town', jurisdictionName: 'Town', serviceAt: 0.006, fromOrgDefault: false });
    expect(entry.passedOver.map((p) => [p.ruleId, p.reason])).toEqual([
      ['region-ratio', 'less_local'],
      ['nation-ratio', 'less_local'],
      ['org-ratio', 'less_local'],
    ]);
  });

  it('falls back to the parent, then the grandparent, then the organisation default, per metric', () => {
    expect(findResolved(resolved, 'co_air_free_ppm', 'low_fire')!.decided?.ruleId).toBe('region-af');
    expect(findResolved(resolved, 'room_co_ppm', null)!.decided?.ruleId).toBe('nation-room');
    const loss = findResolved(resolved, 'flue_loss_pct', 'as_left')!.decided!;
    expect(loss).toMatchObject({ ruleId: 'org-loss', jurisdictionName: 'Org defaults', fromOrgDefault: true });
    expect(findResolved(resolved, 'tightness_drop_mbar', null)!.decided).toBeNull();
  });

  it('carries where each rule came from', () => {
    expect(findResolved(resolved, 'co_co2_ratio', 'high_fire')!.decided).toEqual({
      ruleId: 'town-ratio',
      metric: 'co_co2_ratio',
      scope: { category: null, fuel: null, testPoint: null },
      comparator: 'gt',
      serviceAt: 0.006,
      dangerAt: null,
      source: 'Test source',
      note: null,
      jurisdictionId: 'town',
      jurisdictionName: 'Town',
      profileName: null,
      profileId: 'town-code',
      version: 1,
      effectiveFrom: '2000-01-01',
      fromOrgDefault: false,
      specificity: 0,
    });
  });

  it('has one entry per reading metric and test point and one per inspection-level metric', () => {
    expect(resolved.entries).toHaveLength(4 * 3 + 3);
    expect(resolved.entries.filter((e) => e.metric === 'room_co_ppm').map((e) => e.testPoint)).toEqual([null]);
    expect(resolved.levels.map((l) => [l.jurisdictionId, l.fromOrgDefault, l.version])).toEqual([
      ['town', false, 1],
      ['region', false, 1],
      ['nation', false, 1],
      ['org', true, 1],
    ]);
  });

  it('is plain JSON that judges the same after a round trip (the offline cache)', () => {
    const copy = JSON.parse(JSON.stringify(resolved)) as ResolvedLimits;
    expect(copy).toEqual(resolved);
    const input = { figures: [figures({ ratio: 0.0065, coAirFreeFromO2Ppm: 150 })] };
    expect(judge({ ...input, resolved: copy })).toEqual(judge({ ...input, resolved }));
  });
});

describe('resolveLimits: scope inside one profile', () => {
  const rules = [
    rule({ id: 'any', metric: 'co_co2_ratio', serviceAt: 0.01 }),
    rule({ id: 'boiler', metric: 'co_co2_ratio', serviceAt: 0.009, scope: { category: 'boiler' } }),
    rule({ id: 'boiler-ng', metric: 'co_co2_ratio', serviceAt: 0.008, scope: { category: 'boiler', fuel: 'natural-gas' } }),
    rule({ id: 'boiler-ng-high', metric: 'co_co2_ratio', serviceAt: 0.007, scope: { category: 'boiler', fuel: 'natural-gas', testPoint: 'high_fire' } }),
    rule({ id: 'cooker', metric: 'co_co2_ratio', serviceAt: 0.02, scope: { category: 'cooker' } }),
  ];
  const town = simpleLevel('town', 'Town', rules);

  it('picks the rule with the most non-null scope fields', () => {
    const resolved = resolveLimits({ chain: [town], orgDefault: null, appliance: NG_BOILER, date: '2024-01-01' });
    const high = findResolved(resolved, 'co_co2_ratio', 'high_fire')!;
    expect(high.decided).toMatchObject({ ruleId: 'boiler-ng-high', specificity: 3 });
    expect(high.passedOver.map((p) => [p.ruleId, p.reason])).toEqual([
      ['any', 'less_specific'],
      ['boiler', 'less_specific'],
      ['boiler-ng', 'less_specific'],
    ]);
    // The test-point rule does not reach low fire, so the category+fuel rule decides there.
    expect(findResolved(resolved, 'co_co2_ratio', 'low_fire')!.decided?.ruleId).toBe('boiler-ng');
  });

  it('falls back to less specific rules for another fuel, and ignores other categories', () => {
    const resolved = resolveLimits({ chain: [town], orgDefault: null, appliance: { category: 'boiler', fuel: 'propane' }, date: '2024-01-01' });
    expect(findResolved(resolved, 'co_co2_ratio', 'high_fire')!.decided?.ruleId).toBe('boiler');
    const water = resolveLimits({ chain: [town], orgDefault: null, appliance: { category: 'water_heater', fuel: 'natural-gas' }, date: '2024-01-01' });
    expect(findResolved(water, 'co_co2_ratio', 'high_fire')!.decided?.ruleId).toBe('any');
  });

  it('lists out-of-scope rules only when asked', () => {
    const without = resolveLimits({ chain: [town], orgDefault: null, appliance: NG_BOILER, date: '2024-01-01' });
    expect(findResolved(without, 'co_co2_ratio', 'low_fire')!.passedOver.some((p) => p.reason === 'out_of_scope')).toBe(false);
    const withOut = resolveLimits({ chain: [town], orgDefault: null, appliance: NG_BOILER, date: '2024-01-01', includeOutOfScope: true });
    const outs = findResolved(withOut, 'co_co2_ratio', 'low_fire')!.passedOver.filter((p) => p.reason === 'out_of_scope');
    expect(outs.map((p) => p.ruleId)).toEqual(['boiler-ng-high', 'cooker']);
  });

  it('breaks a specificity tie in favour of the first-defined rule', () => {
    const tied = simpleLevel('town', 'Town', [
      rule({ id: 'by-fuel', metric: 'co_air_free_ppm', serviceAt: 150, scope: { fuel: 'natural-gas' } }),
      rule({ id: 'by-category', metric: 'co_air_free_ppm', serviceAt: 100, scope: { category: 'boiler' } }),
    ]);
    const entry = findResolved(resolveLimits({ chain: [tied], orgDefault: null, appliance: NG_BOILER, date: '2024-01-01' }), 'co_air_free_ppm', 'high_fire')!;
    expect(entry.decided?.ruleId).toBe('by-fuel');
    expect(entry.passedOver).toEqual([expect.objectContaining({ ruleId: 'by-category', reason: 'later_defined' })]);
  });

  it('never applies a test-point scope to room CO, which has no test point', () => {
    const odd = simpleLevel('town', 'Town', [rule({ id: 'room-high', metric: 'room_co_ppm', serviceAt: 10, scope: { testPoint: 'high_fire' } })]);
    expect(findResolved(resolveLimits({ chain: [odd], orgDefault: null, appliance: NG_BOILER, date: '2024-01-01' }), 'room_co_ppm', null)!.decided).toBeNull();
  });
});

describe('resolveLimits: a local any-scope rule against a parent specific-scope rule', () => {
  it('lets the local rule win however specific the parent is', () => {
    const town = simpleLevel('town', 'Town', [rule({ id: 'town-any', metric: 'co_air_free_ppm', serviceAt: 300 })]);
    const nation = simpleLevel('nation', 'Nation', [
      rule({ id: 'nation-exact', metric: 'co_air_free_ppm', serviceAt: 100, scope: { category: 'boiler', fuel: 'natural-gas', testPoint: 'high_fire' } }),
    ]);
    const entry = findResolved(resolveLimits({ chain: [town, nation], orgDefault: null, appliance: NG_BOILER, date: '2024-01-01' }), 'co_air_free_ppm', 'high_fire')!;
    expect(entry.decided?.ruleId).toBe('town-any');
    expect(entry.passedOver).toEqual([expect.objectContaining({ ruleId: 'nation-exact', reason: 'less_local', specificity: 3 })]);
  });

  it('lets a parent decide when the local profile only has rules for another category', () => {
    const town = simpleLevel('town', 'Town', [rule({ id: 'town-cooker', metric: 'co_air_free_ppm', dangerAt: 800, scope: { category: 'cooker' } })]);
    const nation = simpleLevel('nation', 'Nation', [rule({ id: 'nation-any', metric: 'co_air_free_ppm', dangerAt: 400 })]);
    const entry = findResolved(resolveLimits({ chain: [town, nation], orgDefault: null, appliance: NG_BOILER, date: '2024-01-01' }), 'co_air_free_ppm', 'high_fire')!;
    expect(entry.decided?.ruleId).toBe('nation-any');
  });
});

describe('resolveLimits: effective dates', () => {
  const town = level('town', 'Town', [
    version('town-code', 1, '2020-01-01', [rule({ id: 'v1-ratio', metric: 'co_co2_ratio', serviceAt: 0.008 })]),
    version('town-code', 2, '2024-06-01', [rule({ id: 'v2-ratio', metric: 'co_co2_ratio', serviceAt: 0.006 })]),
  ]);
  const nation = simpleLevel('nation', 'Nation', [rule({ id: 'nation-ratio', metric: 'co_co2_ratio', serviceAt: 0.01 })]);

  it('uses the old version for a reading dated the day before the change', () => {
    const entry = findResolved(resolveLimits({ chain: [town, nation], orgDefault: null, appliance: NG_BOILER, date: '2024-05-31' }), 'co_co2_ratio', 'high_fire')!;
    expect(entry.decided).toMatchObject({ ruleId: 'v1-ratio', version: 1, effectiveFrom: '2020-01-01' });
    expect(entry.passedOver).toContainEqual(expect.objectContaining({ ruleId: 'v2-ratio', reason: 'not_in_force' }));
  });

  it('uses the new version from its first day', () => {
    const entry = findResolved(resolveLimits({ chain: [town, nation], orgDefault: null, appliance: NG_BOILER, date: '2024-06-01' }), 'co_co2_ratio', 'high_fire')!;
    expect(entry.decided).toMatchObject({ ruleId: 'v2-ratio', version: 2 });
    expect(entry.passedOver).toContainEqual(expect.objectContaining({ ruleId: 'v1-ratio', reason: 'not_in_force' }));
  });

  it('lets a level with only a future version contribute nothing', () => {
    const future = level('region', 'Region', [version('region-code', 1, '2030-01-01', [rule({ id: 'future-ratio', metric: 'co_co2_ratio', serviceAt: 0.001 })])]);
    const resolved = resolveLimits({ chain: [future, nation], orgDefault: null, appliance: NG_BOILER, date: '2024-06-01' });
    const entry = findResolved(resolved, 'co_co2_ratio', 'high_fire')!;
    expect(entry.decided?.ruleId).toBe('nation-ratio');
    expect(entry.passedOver).toEqual([expect.objectContaining({ ruleId: 'future-ratio', reason: 'not_in_force' })]);
    expect(resolved.levels[0]).toEqual({ jurisdictionId: 'region', jurisdictionName: 'Region', fromOrgDefault: false, profileId: null, version: null, effectiveFrom: null });
  });

  it('prefers the higher version number when two start the same day', () => {
    const a = version('p', 3, '2024-01-01', []);
    const b = version('p', 4, '2024-01-01', []);
    expect(versionInForce([b, a], '2024-02-01')).toBe(b);
    expect(versionInForce([a, b], '2024-02-01')).toBe(b);
    expect(versionInForce([a, b], '2023-12-31')).toBeNull();
  });

  it('refuses a malformed date rather than guessing a version', () => {
    expect(() => resolveLimits({ chain: [town], orgDefault: null, appliance: NG_BOILER, date: '1/6/2024' })).toThrow(RangeError);
    expect(() => resolveLimits({ chain: [town], orgDefault: null, appliance: NG_BOILER, date: '2024-02-30' })).toThrow(RangeError);
  });
});

describe('createLimitResolver', () => {
  const town = simpleLevel('town', 'Town', [rule({ id: 'town-ratio', metric: 'co_co2_ratio', serviceAt: 0.006 })]);
  const nation = level('nation', 'Nation', [
    version('nation-code', 1, '2020-01-01', [rule({ id: 'old-af', metric: 'co_air_free_ppm', serviceAt: 200 })]),
    version('nation-code', 2, '2025-01-01', [rule({ id: 'new-af', metric: 'co_air_free_ppm', serviceAt: 100, scope: { category: 'boiler' } })]),
  ]);
  const input = { chain: [town, nation], orgDefault: null };

  it('answers exactly as resolveLimits does, on either side of a version change', () => {
    const resolver = createLimitResolver(input);
    for (const date of ['2021-06-01', '2026-06-01']) {
      for (const includeOutOfScope of [false, true]) {
        expect(resolver.resolve(NG_BOILER, date, { includeOutOfScope })).toEqual(resolveLimits({ ...input, appliance: NG_BOILER, date, includeOutOfScope }));
      }
    }
  });

  it('memoises per appliance key and date, and freezes the shared answer', () => {
    const resolver = createLimitResolver(input);
    const first = resolver.resolve(NG_BOILER, '2026-06-01');
    expect(resolver.resolve({ ...NG_BOILER }, '2026-06-01')).toBe(first);
    expect(resolver.resolve(NG_BOILER, '2021-06-01')).not.toBe(first);
    expect(resolver.size).toBe(2);
    expect(Object.isFrozen(findResolved(first, 'co_co2_ratio', 'high_fire')!.decided)).toBe(true);
  });

  it('refuses a malformed date like resolveLimits', () => {
    expect(() => createLimitResolver(input).resolve(NG_BOILER, '2026-6-1')).toThrow(RangeError);
  });
});
