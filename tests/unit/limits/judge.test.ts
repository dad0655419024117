import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  VERDICT_LEVELS,
  VERDICT_ORDER,
  judge,
  resolveLimits,
  worstLevel,
  type FiguresAtTestPoint,
  type JudgeableFigures,
  type LimitRule,
  type VerdictLevel,
} from '../../../lib/limits';
import { NG_BOILER, figures, level, rule, simpleLevel, version } from './fixtures';

function resolvedWith(rules: LimitRule[], name = 'Town') {
  return resolveLimits({ chain: [simpleLevel('town', name, rules)], orgDefault: null, appliance: NG_BOILER, date: '2024-06-01' });
}

const RATIO_RULE = rule({ id: 'ratio', metric: 'co_co2_ratio', serviceAt: 0.008, dangerAt: 0.02, source: 'Town code clause 4' });

describe('judge: explanations and provenance', () => {
  it('writes one readable sentence naming the rule, profile version and source', () => {
    const town = level('town', 'Town', [
      version('town-code', 1, '2020-01-01', [rule({ id: 'old', metric: 'co_co2_ratio', serviceAt: 0.01, source: 'Old clause' })]),
      version('town-code', 2, '2024-01-01', [RATIO_RULE]),
    ]);
    const resolved = resolveLimits({ chain: [town], orgDefault: null, appliance: NG_BOILER, date: '2024-06-01' });
    const verdict = judge({ figures: [figures({ ratio: 0.0092 })], resolved });
    expect(verdict.overall).toBe('service');
    expect(verdict.decidedBy).toMatchObject({
      metric: 'co_co2_ratio',
      testPoint: 'high_fire',
      value: 0.0092,
      level: 'service',
      threshold: 0.008,
      thresholdKind: 'service',
      comparator: 'gt',
      ruleId: 'ratio',
      profileId: 'town-code',
      version: 2,
      jurisdictionId: 'town',
      jurisdictionName: 'Town',
      source: 'Town code clause 4',
      fromManufacturer: false,
    });
    expect(verdict.decidedBy?.explanation).toBe(
      'CO/CO2 ratio 0.0092 at high fire is above the service level 0.008 (rule from Town code, v2, source: Town code clause 4)',
    );
  });

  it('reports the service threshold when clear', () => {
    const verdict = judge({ figures: [figures({ ratio: 0.004, testPoint: 'low_fire' })], resolved: resolvedWith([RATIO_RULE]) });
    expect(verdict.overall).toBe('clear');
    expect(verdict.decidedBy).toBeNull();
    expect(verdict.items[0]).toMatchObject({ level: 'clear', threshold: 0.008, thresholdKind: 'service' });
    expect(verdict.items[0]!.explanation).toBe(
      'CO/CO2 ratio 0.004 at low fire does not exceed the service level 0.008 (rule from Town code, v1, source: Town code clause 4)',
    );
  });

  it('names the organisation default when it decided', () => {
    const org = simpleLevel('org', 'Acme defaults', [RATIO_RULE]);
    const resolved = resolveLimits({ chain: [simpleLevel('town', 'Town', [])], orgDefault: org, appliance: NG_BOILER, date: '2024-06-01' });
    expect(judge({ figures: [figures({ ratio: 0.03 })], resolved }).decidedBy?.explanation).toContain('rule from organisation default Acme defaults code, v1');
  });

  it('uses the O2 route for air-free CO where present, else the CO2 route, and says which', () => {
    const resolved = resolvedWith([rule({ metric: 'co_air_free_ppm', serviceAt: 100, dangerAt: 400 })]);
    const byO2 = judge({ figures: [figures({ coAirFreeFromO2Ppm: 160, coAirFreeFromCo2Ppm: 158 })], resolved });
    expect(byO2.items[0]).toMatchObject({ value: 160, airFreeRoute: 'o2', level: 'service' });
    expect(byO2.items[0]!.explanation).toMatch(/^Air-free CO \(O2 route\) 160 ppm at high fire is above the service level 100 ppm/);
    const byCo2 = judge({ figures: [figures({ coAirFreeFromO2Ppm: null, coAirFreeFromCo2Ppm: 158, testPoint: 'as_left' })], resolved });
    expect(byCo2.items[0]).toMatchObject({ value: 158, airFreeRoute: 'co2' });
    expect(byCo2.items[0]!.explanation).toMatch(/^Air-free CO \(CO2 route\) 158 ppm as left is above/);
  });

  it('names the room and duration of a room check', () => {
    const resolved = resolvedWith([rule({ metric: 'room_co_ppm', comparator: 'gte', serviceAt: 10, dangerAt: 30 })]);
    const verdict = judge({ figures: [], roomChecks: [{ room: 'Kitchen', coPpm: 12, minutes: 15 }], resolved });
    expect(verdict.items[0]).toMatchObject({ metric: 'room_co_ppm', subject: 'Kitchen', testPoint: null, level: 'service' });
    expect(verdict.items[0]!.explanation).toMatch(/^Room CO 12 ppm in Kitchen over 15 min is at or above the service level 10 ppm/);
  });
});

describe('judge: threshold boundaries', () => {
  // gt: "shall not exceed" — exactly at the threshold is within it.
  const gt = resolvedWith([rule({ metric: 'co_air_free_ppm', comparator: 'gt', serviceAt: 100, dangerAt: 400 })]);
  // gte: "10 ppm or more" — exactly at the threshold trips it.
  const gte = resolvedWith([rule({ metric: 'room_co_ppm', comparator: 'gte', serviceAt: 10, dangerAt: 30 })]);

  it.each([
    [99.9, 'clear'],
    [100, 'clear'],
    [100.1, 'service'],
    [400, 'service'],
    [400.1, 'danger'],
  ] as const)('gt: air-free %s ppm against service 100 / danger 400 is %s', (value, expected) => {
    expect(judge({ figures: [figures({ coAirFreeFromO2Ppm: value })], resolved: gt }).items[0]!.level).toBe(expected);
  });

  it.each([
    [9.9, 'clear'],
    [10, 'service'],
    [29.9, 'service'],
    [30, 'danger'],
  ] as const)('gte: room CO %s ppm against service 10 / danger 30 is %s', (value, expected) => {
    expect(judge({ figures: [], roomChecks: [{ room: 'Lounge', coPpm: value }], resolved: gte }).items[0]!.level).toBe(expected);
  });

  it('treats floating-point noise at a threshold as exactly at it', () => {
    const resolved = resolvedWith([rule({ metric: 'co_co2_ratio', serviceAt: 0.3 })]);
    expect(0.1 + 0.2).toBeGreaterThan(0.3);
    expect(judge({ figures: [figures({ ratio: 0.1 + 0.2 })], resolved }).items[0]!.level).toBe('clear');
    expect(judge({ figures: [figures({ ratio: 0.3001 })], resolved }).items[0]!.level).toBe('service');
  });

  it('judges spillage as 1 = fail, 0 = pass', () => {
    const resolved = resolvedWith([rule({ metric: 'spillage', comparator: 'gte', dangerAt: 1 })]);
    const failed = judge({ figures: [], spillage: 'fail', resolved });
    expect(failed.items[0]).toMatchObject({ metric: 'spillage', value: 1, level: 'danger' });
    expect(failed.items[0]!.explanation).toMatch(/^Spillage test failed, which trips the danger level/);
    expect(judge({ figures: [], spillage: 'pass', resolved }).overall).toBe('clear');
    expect(judge({ figures: [], spillage: null, resolved }).items).toEqual([]);
  });

  it('judges a tightness drop against gt, where exactly at the threshold passes', () => {
    const resolved = resolvedWith([rule({ metric: 'tightness_drop_mbar', comparator: 'gt', dangerAt: 0 })]);
    expect(judge({ figures: [], tightnessDropMbar: 0, resolved }).overall).toBe('clear');
    expect(judge({ figures: [], tightnessDropMbar: 0.5, resolved }).overall).toBe('danger');
  });
});

describe('judge: manufacturer limits', () => {
  const resolved = resolvedWith([RATIO_RULE]);

  it('replaces the service level with a stricter manufacturer figure', () => {
    const verdict = judge({ figures: [figures({ ratio: 0.006 })], resolved, manufacturer: { coCo2Ratio: 0.005 } });
    expect(verdict.overall).toBe('service');
    expect(verdict.items[0]).toMatchObject({ threshold: 0.005, thresholdKind: 'service', fromManufacturer: true, ruleId: 'ratio', source: "manufacturer's instructions" });
    expect(verdict.items[0]!.explanation).toContain("manufacturer's figure, stricter than 0.008 in the code");
    const under = judge({ figures: [figures({ ratio: 0.004 })], resolved, manufacturer: { coCo2Ratio: 0.005 } });
    expect(under.items[0]).toMatchObject({ level: 'clear', threshold: 0.005, fromManufacturer: true });
  });

  it('keeps the code danger level above a stricter manufacturer figure', () => {
    const verdict = judge({ figures: [figures({ ratio: 0.025 })], resolved, manufacturer: { coCo2Ratio: 0.005 } });
    expect(verdict.items[0]).toMatchObject({ level: 'danger', threshold: 0.02, fromManufacturer: false, source: 'Town code clause 4' });
  });

  it('ignores a looser manufacturer figure', () => {
    const over = judge({ figures: [figures({ ratio: 0.009 })], resolved, manufacturer: { coCo2Ratio: 0.01 } });
    expect(over.items[0]).toMatchObject({ level: 'service', threshold: 0.008, fromManufacturer: false });
    const clear = judge({ figures: [figures({ ratio: 0.007 })], resolved, manufacturer: { coCo2Ratio: 0.01 } });
    expect(clear.items[0]).toMatchObject({ level: 'clear', threshold: 0.008, fromManufacturer: false });
  });

  it('adds a service level under a danger-only rule', () => {
    const dangerOnly = resolvedWith([rule({ metric: 'co_air_free_ppm', dangerAt: 400 })]);
    const judged = (value: number) => judge({ figures: [figures({ coAirFreeFromO2Ppm: value })], resolved: dangerOnly, manufacturer: { coAirFreePpm: 300 } }).items[0]!;
    expect(judged(350)).toMatchObject({ level: 'service', threshold: 300, fromManufacturer: true });
    expect(judged(450)).toMatchObject({ level: 'danger', threshold: 400, fromManufacturer: false });
  });

  it('gives a service level on its own where no code rule exists', () => {
    const verdict = judge({ figures: [figures({ coPpm: 120 })], resolved: resolvedWith([]), manufacturer: { coAsMeasuredPpm: 100 } });
    expect(verdict.items[0]).toMatchObject({
      metric: 'co_as_measured_ppm',
      level: 'service',
      threshold: 100,
      comparator: 'gt',
      ruleId: null,
      fromManufacturer: true,
      source: "manufacturer's instructions",
    });
    expect(verdict.items[0]!.explanation).toContain("manufacturer's figure; no code limit is configured");
  });

  it('ignores a blank or zero manufacturer figure', () => {
    const verdict = judge({ figures: [figures({ ratio: 0.007 })], resolved, manufacturer: { coCo2Ratio: 0, coAirFreePpm: null } });
    expect(verdict.items[0]).toMatchObject({ level: 'clear', threshold: 0.008, fromManufacturer: false });
  });
});

describe('judge: unknown is never a silent clear', () => {
  it('marks a measured CO figure with no limit as unknown when no CO measure was judged', () => {
    // Only a ratio rule; the ratio itself was not computed (no CO2), so CO could not be judged.
    const verdict = judge({ figures: [figures({ coPpm: 120, ratio: null, coAirFreeFromO2Ppm: 160 })], resolved: resolvedWith([RATIO_RULE]) });
    expect(verdict.overall).toBe('unknown');
    expect(verdict.items.map((i) => [i.metric, i.level])).toEqual([
      ['co_air_free_ppm', 'unknown'],
      ['co_as_measured_ppm', 'unknown'],
    ]);
    expect(verdict.items[0]!.explanation).toMatch(/^no limit configured for air-free CO at high fire/);
    expect(verdict.decidedBy?.metric).toBe('co_air_free_ppm');
  });

  it('lists figures the limits do not cover once CO was judged, without scoring them', () => {
    const verdict = judge({
      figures: [figures({ coPpm: 120, ratio: 0.00135, coAirFreeFromO2Ppm: 160, flueLossPct: 8.2 })],
      resolved: resolvedWith([RATIO_RULE]),
    });
    expect(verdict.overall).toBe('clear');
    expect(verdict.items.map((i) => i.metric)).toEqual(['co_co2_ratio']);
    expect(verdict.notJudged.map((n) => n.metric)).toEqual(['co_air_free_ppm', 'co_as_measured_ppm', 'flue_loss_pct']);
    expect(verdict.notJudged[2]!.explanation).toBe('Flue loss 8.2 % at high fire was not judged: no limit is configured for it, and CO was judged by another measure');
  });

  it('does not let a flue-loss limit stand in for CO', () => {
    const verdict = judge({ figures: [figures({ coPpm: 120, flueLossPct: 8 })], resolved: resolvedWith([rule({ metric: 'flue_loss_pct', serviceAt: 11 })]) });
    expect(verdict.overall).toBe('unknown');
    expect(verdict.items.map((i) => [i.metric, i.level])).toEqual([
      ['co_as_measured_ppm', 'unknown'],
      ['flue_loss_pct', 'clear'],
    ]);
  });

  it('is unknown for a room check, spillage or tightness result with no limit', () => {
    const resolved = resolvedWith([RATIO_RULE]);
    const base = { figures: [figures({ ratio: 0.001 })], resolved };
    expect(judge({ ...base, roomChecks: [{ room: 'Hall', coPpm: 2 }] }).overall).toBe('unknown');
    expect(judge({ ...base, spillage: 'pass' }).items[1]!.explanation).toBe(
      'no limit configured for spillage test; the value passed cannot be judged',
    );
    expect(judge({ ...base, tightnessDropMbar: 0.2 }).overall).toBe('unknown');
  });

  it('adds one unknown item when limits exist but no reading could be judged', () => {
    const resolved = resolvedWith([RATIO_RULE, rule({ metric: 'co_air_free_ppm', dangerAt: 400 }), rule({ metric: 'room_co_ppm', comparator: 'gte', serviceAt: 10 })]);
    const verdict = judge({ figures: [], roomChecks: [{ room: 'Kitchen', coPpm: 1 }], resolved });
    expect(verdict.overall).toBe('unknown');
    expect(verdict.items.filter((i) => i.level === 'unknown')).toEqual([
      expect.objectContaining({ metric: 'co_co2_ratio', testPoint: null, value: null, explanation: expect.stringContaining('CO/CO2 ratio, air-free CO') }),
    ]);
  });

  it('is unknown when nothing at all was judged', () => {
    const verdict = judge({ figures: [], resolved: resolvedWith([]) });
    expect(verdict).toEqual({ overall: 'unknown', items: [], decidedBy: null, notJudged: [] });
  });

  it('is unknown for a value that is not a finite number', () => {
    const verdict = judge({ figures: [figures({ ratio: Number.NaN })], resolved: resolvedWith([RATIO_RULE]) });
    expect(verdict.items.find((i) => i.metric === 'co_co2_ratio')).toMatchObject({ level: 'unknown' });
    expect(verdict.overall).toBe('unknown');
  });

  it('skips a metric that was not measured when another was judged', () => {
    const resolved = resolvedWith([RATIO_RULE, rule({ metric: 'co_air_free_ppm', dangerAt: 400 })]);
    const verdict = judge({ figures: [figures({ ratio: 0.002, coAirFreeFromO2Ppm: null, coAirFreeFromCo2Ppm: null })], resolved });
    expect(verdict.overall).toBe('clear');
    expect(verdict.items.map((i) => i.metric)).toEqual(['co_co2_ratio']);
  });
});

describe('judge: overall order', () => {
  const resolved = resolvedWith([
    RATIO_RULE,
    rule({ metric: 'room_co_ppm', comparator: 'gte', serviceAt: 10, dangerAt: 30 }),
  ]);

  it('ranks danger over service over unknown over clear', () => {
    expect(VERDICT_ORDER).toEqual(['clear', 'unknown', 'service', 'danger']);
    const cases: Array<[number, number | null, VerdictLevel]> = [
      [0.001, 1, 'clear'],
      [0.001, null, 'unknown'],
      [0.009, null, 'service'],
      [0.009, 31, 'danger'],
      [0.001, 30, 'danger'],
    ];
    for (const [ratio, roomPpm, expected] of cases) {
      const verdict = judge({
        figures: [figures({ ratio })],
        roomChecks: roomPpm === null ? [] : [{ room: 'Kitchen', coPpm: roomPpm }],
        tightnessDropMbar: roomPpm === null ? 0.1 : null, // no tightness rule: unknown
        resolved,
      });
      expect(verdict.overall, `ratio ${ratio}, room ${roomPpm}`).toBe(expected);
    }
  });

  it('is decided by the first item at the worst level', () => {
    const verdict = judge({
      figures: [figures({ ratio: 0.009, testPoint: 'high_fire' }), figures({ ratio: 0.03, testPoint: 'low_fire' })],
      roomChecks: [{ room: 'Kitchen', coPpm: 40 }],
      resolved,
    });
    expect(verdict.overall).toBe('danger');
    expect(verdict.decidedBy).toMatchObject({ metric: 'co_co2_ratio', testPoint: 'low_fire', level: 'danger' });
  });

  it('worstLevel: never clear when any level is not clear, and empty is unknown', () => {
    expect(worstLevel([])).toBe('unknown');
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...VERDICT_LEVELS), { minLength: 1 }), (levels) => {
        const worst = worstLevel(levels);
        expect(levels).toContain(worst);
        for (const level of levels) expect(VERDICT_ORDER.indexOf(worst)).toBeGreaterThanOrEqual(VERDICT_ORDER.indexOf(level));
        if (levels.some((l) => l !== 'clear')) expect(worst).not.toBe('clear');
      }),
    );
  });

  it('never gives clear while any item is unknown, service or danger (random readings)', () => {
    const value = fc.option(fc.double({ min: 0, max: 0.05, noNaN: true }), { nil: null });
    fc.assert(
      fc.property(fc.array(fc.record({ ratio: value, coPpm: fc.integer({ min: 0, max: 2000 }) }), { maxLength: 3 }), (rows) => {
        const verdict = judge({ figures: rows.map((r) => figures(r)), resolved });
        const levels = verdict.items.map((i) => i.level);
        if (verdict.overall === 'clear') expect(levels.length > 0 && levels.every((l) => l === 'clear')).toBe(true);
        expect(verdict.overall).toBe(worstLevel(levels));
      }),
    );
  });
});

describe('judge: figures input', () => {
  it('accepts a combustion analysis shape structurally, with a test point added', () => {
    // Mirrors the fields lib/combustion's FlueGasAnalysis has; extra fields must not get in the way.
    const analysis = { fuel: 'natural-gas' as const, coPpm: 120, ratio: 0.00135, coAirFreeFromO2Ppm: 160, coAirFreeFromCo2Ppm: 158, flueLossPct: 8.23, lambda: 1.33, warnings: [] as Array<{ code: string; message: string }> };
    const asFigures: JudgeableFigures = analysis;
    const atPoint: FiguresAtTestPoint = { ...asFigures, testPoint: 'high_fire' };
    expect(judge({ figures: [atPoint], resolved: resolvedWith([RATIO_RULE]) }).overall).toBe('clear');
  });
});
