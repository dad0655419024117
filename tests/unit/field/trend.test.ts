// lib/field/trend: the field bundle's trend per appliance, reduced from lib/insight's history.
// Invented readings and limits; the flag rule itself (issue #9: rose across the last three
// inspections, or past half the service limit) is tested in tests/unit/insight/trend.test.ts.
import { describe, expect, it } from 'vitest';
import { fieldTrend, TREND_POINTS_SHOWN, withTrends } from '@/lib/field/trend';
import type { FieldBundle } from '@/lib/field';
import type { HistoryInspectionInput } from '@/lib/insight';
import type { JurisdictionLevel } from '@/lib/limits';
import type { ApplianceDetails } from '@/lib/validations/inspection';

const level: JurisdictionLevel = {
  jurisdictionId: 'j1',
  name: 'Test borough',
  versions: [
    {
      profileId: 'p1',
      version: 1,
      effectiveFrom: '2015-01-01',
      rules: [{ id: 'r1', metric: 'co_co2_ratio', scope: { category: 'boiler', fuel: null, testPoint: null }, comparator: 'gt', serviceAt: 0.008, dangerAt: 0.04, source: 'Test profile (invented)' }],
    },
  ],
};
const limitContext = { chain: [level], orgDefault: null };

const details: ApplianceDetails = {
  category: 'boiler', fuel: 'natural-gas', flueType: 'room_sealed', location: 'Kitchen', make: null, model: null, serial: null,
  ratedInputKw: null, mfrRatioMax: null, mfrCoAirFreeMaxPpm: null, mfrCoMaxPpm: null,
};

// CO = ratio × 10 000 × CO2, so a CO2 of 10 % makes the ratio CO / 100 000.
const inspection = (year: number, coPpm: number): HistoryInspectionInput => ({
  inspectionId: `i-${year}`,
  visitId: `v-${year}`,
  date: `${year}-06-01`,
  verdict: 'clear',
  readings: [{ testPoint: 'high_fire', coPpm, co2Pct: 10, o2Pct: 2.9, flueTempC: 170, airTempC: 18 }],
});

describe('fieldTrend', () => {
  it('keeps the latest few points for the phone but judges the flag on every inspection', () => {
    const all = [2016, 2017, 2018, 2019, 2020, 2021, 2022, 2023].map((y, i) => inspection(y, 40 + i * 10));
    const trend = fieldTrend({ applianceId: 'a1', details, inspections: all, limitContext });
    expect(trend.inspections).toBe(8);
    expect(trend.points).toHaveLength(TREND_POINTS_SHOWN);
    expect(trend.points.at(-1)).toEqual({ date: '2023-06-01', verdict: 'clear', ratio: 0.0011, serviceLimit: 0.008, dangerLimit: 0.04 });
    expect(trend.worsening).toBe(true);
    expect(trend.reasons).toEqual(['rising']);
  });

  it("uses the manufacturer's ratio limit when it is stricter, and flags past half of it", () => {
    const trend = fieldTrend({ applianceId: 'a1', details: { ...details, mfrRatioMax: 0.004 }, inspections: [inspection(2023, 250)], limitContext });
    expect(trend.points[0]!.serviceLimit).toBe(0.004);
    expect(trend.reasons).toEqual(['over_half_limit']);
  });

  it('flags nothing without earlier inspections', () => {
    const trend = fieldTrend({ applianceId: 'a1', details, inspections: [], limitContext });
    expect(trend).toMatchObject({ worsening: false, inspections: 0, points: [], hints: [] });
  });
});

describe('withTrends', () => {
  it("leaves each visit's own inspection out of its appliance's trend", () => {
    const appliance = { id: 'a1', details, updatedAt: '', history: [] };
    const visit = (id: string) => ({
      id, status: 'booked' as const, kind: 'annual_check', windowStart: '', windowEnd: '', notes: null, appliances: [appliance],
      site: { id: 's1', reference: 'R-1', address: '', town: '', postcode: '', accessNotes: null, tenantName: null, tenantPhone: null, jurisdictionId: 'j1', jurisdictionName: 'Test borough' },
    });
    const bundle: FieldBundle = { visits: [visit('v-2023'), visit('v-new')], limitContexts: { j1: limitContext }, analysers: [], timeZone: 'UTC', fetchedAt: '' };
    const out = withTrends(bundle, new Map([['a1', [inspection(2021, 40), inspection(2022, 50), inspection(2023, 60)]]]));
    expect(out.visits[0]!.appliances[0]!.trend!.inspections).toBe(2);
    expect(out.visits[1]!.appliances[0]!.trend!.inspections).toBe(3);
    expect(out.visits[1]!.appliances[0]!.trend!.reasons).toContain('rising');
    // The input bundle is left as it was.
    expect(bundle.visits[0]!.appliances[0]!.trend).toBeUndefined();
  });
});
