// analyseFlueGas: which figures it gives for which inputs, and when it warns.
// Figures are worked from the formulas in the reference sheet; warning thresholds are ours.
import { describe, expect, it } from 'vitest';
import { analyseFlueGas, co2MaxForFuel, type FlueGasAnalysis } from '../../../lib/combustion';

function codes(result: FlueGasAnalysis): string[] {
  return result.warnings.map((w) => w.code);
}

describe('analyseFlueGas: figures and nulls', () => {
  it('with CO alone gives only the echoed inputs and the default CO2max', () => {
    const result = analyseFlueGas({ fuel: 'propane', coPpm: 30 });
    expect(result).toEqual({
      fuel: 'propane',
      co2MaxPct: co2MaxForFuel('propane'),
      coPpm: 30,
      ratio: null,
      coAirFreeFromO2Ppm: null,
      coAirFreeFromCo2Ppm: null,
      co2FromO2Pct: null,
      lambda: null,
      excessAirPct: null,
      flueLossPct: null,
      netEfficiencyPct: null,
      warnings: [],
    });
  });

  it('with CO and CO2 only gives the ratio and CO2-route air-free CO (BS 7967 ratio; ANSI Z21 ultimate CO2)', () => {
    const result = analyseFlueGas({ fuel: 'natural-gas', coPpm: 100, co2Pct: 5.85 });
    expect(result.ratio).toBeCloseTo(100 / 10_000 / 5.85, 12);
    expect(result.coAirFreeFromCo2Ppm).toBeCloseTo(200, 9);
    expect(result.coAirFreeFromO2Ppm).toBeNull();
    expect(result.co2FromO2Pct).toBeNull();
    expect(result.lambda).toBeNull();
    expect(result.flueLossPct).toBeNull();
  });

  it('with CO and O2 only gives the O2-route figures, no ratio', () => {
    const result = analyseFlueGas({ fuel: 'natural-gas', coPpm: 50, o2Pct: 10.45 });
    expect(result.ratio).toBeNull();
    expect(result.coAirFreeFromCo2Ppm).toBeNull();
    expect(result.coAirFreeFromO2Ppm).toBeCloseTo(100, 9);
    expect(result.co2FromO2Pct).toBeCloseTo(5.85, 9);
    expect(result.lambda).toBeCloseTo(2, 12);
    expect(result.excessAirPct).toBeCloseTo(100, 10);
    expect(result.flueLossPct).toBeNull();
    expect(result.netEfficiencyPct).toBeNull();
  });

  it('flue loss needs O2 and both temperatures; net efficiency is 100 minus it (1. BImSchV Siegert)', () => {
    expect(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, flueTempC: 120, airTempC: 20 }).flueLossPct).toBeNull();
    expect(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 10, flueTempC: 120 }).flueLossPct).toBeNull();
    const result = analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 10, flueTempC: 120, airTempC: 20 });
    expect(result.flueLossPct).toBeCloseTo(6.9, 10);
    expect(result.netEfficiencyPct).toBeCloseTo(93.1, 10);
  });

  it('a given CO2max replaces the fuel default', () => {
    const result = analyseFlueGas({ fuel: 'natural-gas', coPpm: 100, co2Pct: 6, co2MaxPct: 12 });
    expect(result.co2MaxPct).toBe(12);
    expect(result.coAirFreeFromCo2Ppm).toBeCloseTo(200, 9);
  });

  it('treats null like a missing reading, because JSON cannot carry undefined', () => {
    const input = { fuel: 'natural-gas', coPpm: 10, co2Pct: null, o2Pct: null } as unknown as Parameters<typeof analyseFlueGas>[0];
    const result = analyseFlueGas(input);
    expect(result.ratio).toBeNull();
    expect(result.lambda).toBeNull();
  });
});

describe('analyseFlueGas: warnings', () => {
  it('co2_o2_mismatch when measured CO2 is more than 0.5 points from CO2 expected from O2', () => {
    // CO2 from O2 at 5.2 % O2 and CO2max 11.7 is 8.789 %.
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 5.2, co2Pct: 8.2 }))).toContain('co2_o2_mismatch');
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 5.2, co2Pct: 9.4 }))).toContain('co2_o2_mismatch');
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 5.2, co2Pct: 8.4 }))).not.toContain('co2_o2_mismatch');
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, co2Pct: 2 }))).not.toContain('co2_o2_mismatch');
  });

  it('sample_diluted when O2 is above 18 %, and not at 18 %', () => {
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 18.5 }))).toContain('sample_diluted');
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 18 }))).not.toContain('sample_diluted');
  });

  it('air-free figures are still given for a diluted sample, with the warning beside them', () => {
    const result = analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 19.9 });
    expect(result.coAirFreeFromO2Ppm).toBeCloseTo(209, 9);
  });

  it('co2_above_max when measured CO2 exceeds CO2max', () => {
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, co2Pct: 12.5 }))).toContain('co2_above_max');
    expect(codes(analyseFlueGas({ fuel: 'gas-oil', coPpm: 10, co2Pct: 12.5 }))).not.toContain('co2_above_max');
  });

  it('temperature_inverted when the flue is colder than the air: no flue loss, no throw', () => {
    const result = analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 5, flueTempC: 15, airTempC: 20 });
    expect(codes(result)).toContain('temperature_inverted');
    expect(result.flueLossPct).toBeNull();
    expect(result.netEfficiencyPct).toBeNull();
    // Other figures are still given.
    expect(result.lambda).not.toBeNull();
  });

  it('temperature_inverted needs only the two temperatures', () => {
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, flueTempC: 15, airTempC: 20 }))).toEqual([
      'temperature_inverted',
    ]);
  });

  it('possible_condensing when flue loss is given for a flue at or below 60 °C (Siegert does not hold there)', () => {
    const low = analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 4, flueTempC: 50, airTempC: 20 });
    expect(codes(low)).toContain('possible_condensing');
    expect(low.flueLossPct).not.toBeNull();
    expect(codes(analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 4, flueTempC: 90, airTempC: 20 }))).not.toContain(
      'possible_condensing',
    );
  });

  it('warning messages are plain sentences that say what to check', () => {
    const result = analyseFlueGas({ fuel: 'natural-gas', coPpm: 10, o2Pct: 19, co2Pct: 14, flueTempC: 10, airTempC: 20 });
    expect(codes(result).sort()).toEqual(['co2_above_max', 'co2_o2_mismatch', 'sample_diluted', 'temperature_inverted']);
    for (const warning of result.warnings) {
      expect(warning.message).toMatch(/^[A-Z].*\.$/s);
      expect(warning.message).toMatch(/[Cc]heck/);
      expect(warning.message).not.toMatch(/NaN|undefined|Infinity/);
    }
  });
});
