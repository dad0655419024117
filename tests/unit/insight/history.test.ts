// lib/insight buildApplianceHistory: derived figures per inspection, the limits in force on each
// date, the trend flag and the payload size. Invented readings; limits invented for the test.
import { describe, expect, it } from 'vitest';
import { buildApplianceHistory, type HistoryInspectionInput } from '@/lib/insight';
import type { JurisdictionLevel, LimitRule } from '@/lib/limits';

const ratioRule = (serviceAt: number): LimitRule => ({
  id: `r-${serviceAt}`,
  metric: 'co_co2_ratio',
  scope: { category: 'boiler', fuel: null, testPoint: null },
  comparator: 'gt',
  serviceAt,
  dangerAt: null,
  source: 'Test profile (invented)',
});
const level: JurisdictionLevel = {
  jurisdictionId: 'j1',
  name: 'Test borough',
  versions: [
    { profileId: 'p1', version: 1, effectiveFrom: '2023-01-01', rules: [ratioRule(0.008)] },
    { profileId: 'p1', version: 2, effectiveFrom: '2025-01-01', rules: [ratioRule(0.006)] },
  ],
};

const inspection = (date: string, coPpm: number, co2Pct: number): HistoryInspectionInput => ({
  inspectionId: `i-${date}`,
  visitId: `v-${date}`,
  date,
  verdict: 'clear',
  readings: [
    { testPoint: 'high_fire', coPpm, co2Pct, o2Pct: 5.2, flueTempC: 180, airTempC: 18 },
    { testPoint: 'low_fire', coPpm: coPpm / 2, co2Pct, o2Pct: 5.2, flueTempC: 150, airTempC: 18 },
  ],
});

const appliance = { id: 'a1', label: 'Boiler, utility room', category: 'boiler' as const, fuel: 'natural-gas' as const, manufacturer: { coCo2Ratio: null, coAirFreePpm: null } };

describe('buildApplianceHistory', () => {
  const history = buildApplianceHistory({
    appliance,
    inspections: [inspection('2025-03-01', 36, 9), inspection('2023-03-01', 9, 9), inspection('2024-03-01', 18, 9)],
    limitContext: { chain: [level], orgDefault: null },
  });

  it('orders points oldest first with the worst ratio of each inspection (ratio = CO/10 000/CO2)', () => {
    expect(history.points.map((p) => p.date)).toEqual(['2023-03-01', '2024-03-01', '2025-03-01']);
    expect(history.points.map((p) => p.ratio)).toEqual([0.0001, 0.0002, 0.0004]);
  });

  it('carries the limit in force on each date: 0.008 before 2025, 0.006 after', () => {
    expect(history.points.map((p) => p.limits.ratio.service)).toEqual([0.008, 0.008, 0.006]);
    expect(history.points[0]!.limits.flueLossPct.service).toBeNull();
  });

  it('flags the rising ratio and adds the ratio-rising hint', () => {
    expect(history.trend.worsening).toBe(true);
    expect(history.trend.reasons).toEqual(['rising']);
    expect(history.hints.map((h) => h.code)).toContain('ratio_rising');
  });

  it("a manufacturer's stricter ratio replaces the code's service level", () => {
    const h = buildApplianceHistory({ appliance: { ...appliance, manufacturer: { coCo2Ratio: 0.004, coAirFreePpm: null } }, inspections: [inspection('2025-03-01', 36, 9)], limitContext: { chain: [level], orgDefault: null } });
    expect(h.points[0]!.limits.ratio).toMatchObject({ service: 0.004, source: "manufacturer's instructions" });
  });

  it('stays small enough to cache with a visit: ten years of inspections under 10 kB of JSON', () => {
    const many = Array.from({ length: 10 }, (_, i) => inspection(`${2016 + i}-03-01`, 10 + i, 9));
    const h = buildApplianceHistory({ appliance, inspections: many, limitContext: { chain: [level], orgDefault: null } });
    expect(JSON.stringify(h).length).toBeLessThan(10_000);
  });
});
