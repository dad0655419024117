// lib/insight diagnosticHints: one case that triggers each rule and one that does not. The
// thresholds are common practice (HINT_THRESHOLDS), not published limits; figures invented.
import { describe, expect, it } from 'vitest';
import { diagnosticHints, type HintReading } from '@/lib/insight';

const normal: HintReading = {
  fuel: 'natural-gas',
  category: 'boiler',
  coPpm: 40,
  co2Pct: 8.9,
  o2Pct: 5.2,
  flueTempC: 180,
  airTempC: 18,
  ratio: 0.00045,
  coAirFreePpm: 53,
};
const codes = (reading: Partial<HintReading>, ratioRising = false) => diagnosticHints({ reading: { ...normal, ...reading }, ratioRising }).map((h) => h.code);

describe('diagnosticHints', () => {
  it('a normal reading raises nothing (worked example 1 of the reference sheet, CO lowered)', () => {
    expect(codes({})).toEqual([]);
  });

  it('high CO with low O2 → air starvation / over-gassing checks', () => {
    // O2 2.0 % → CO2 from O2 = 11.7 × 18.9/20.9 = 10.58 %, so CO2 10.6 keeps the sensors consistent.
    expect(codes({ coPpm: 300, o2Pct: 2.0, co2Pct: 10.6, coAirFreePpm: 332, ratio: 0.0028 })).toEqual(['high_co_low_o2']);
    // Same low O2, CO not high: nothing.
    expect(codes({ coPpm: 20, o2Pct: 2.0, co2Pct: 10.6, coAirFreePpm: 22, ratio: 0.0002 })).toEqual([]);
  });

  it('high CO with high O2 → flame chilling / impingement checks', () => {
    // O2 11 % → CO2 from O2 = 11.7 × 9.9/20.9 = 5.54 %.
    expect(codes({ coPpm: 80, o2Pct: 11, co2Pct: 5.5, coAirFreePpm: 169, ratio: 0.0015 })).toEqual(['high_co_high_o2']);
    expect(codes({ coPpm: 20, o2Pct: 11, co2Pct: 5.5, coAirFreePpm: 42, ratio: 0.0004 })).toEqual([]);
  });

  it('measured CO2 far from CO2 computed from O2 → sample leak / sensor checks', () => {
    // Expected 8.79 % from O2 5.2 (worked example 1); 7.9 % is 0.9 points away.
    expect(codes({ co2Pct: 7.9 })).toEqual(['co2_o2_mismatch']);
    // 8.5 % is 0.29 points away: within the 0.5-point practice tolerance.
    expect(codes({ co2Pct: 8.5 })).toEqual([]);
  });

  it('very high flue temperature → over-firing / fouled heat exchanger checks; a lower bar for condensing boilers', () => {
    expect(codes({ flueTempC: 290 })).toEqual(['high_flue_temp']);
    expect(codes({ flueTempC: 240 })).toEqual([]);
    expect(codes({ category: 'condensing_boiler', flueTempC: 130 })).toEqual(['high_flue_temp']);
    expect(codes({ category: 'condensing_boiler', flueTempC: 55 })).toEqual([]);
  });

  it('ratio rising over time → gradual deterioration checks, only when the trend says so', () => {
    expect(codes({}, true)).toEqual(['ratio_rising']);
    expect(codes({}, false)).toEqual([]);
  });

  it('every hint is worded as things to check and marked common practice, never a verdict', () => {
    const hints = diagnosticHints({ reading: { ...normal, coPpm: 300, o2Pct: 2, co2Pct: 7, coAirFreePpm: 332, ratio: 0.004, flueTempC: 300 }, ratioRising: true });
    expect(hints.length).toBe(4);
    for (const h of hints) {
      expect(h.basis).toBe('common practice');
      expect(h.checks.length).toBeGreaterThan(0);
      expect(`${h.title} ${h.checks.join(' ')}`).not.toMatch(/\b(danger|unsafe|fail|condemn)/i);
    }
  });
});
