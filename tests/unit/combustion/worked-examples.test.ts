// The five worked examples in shared/reference/combustion-figures.md, worked from the formulas in
// the reference sheet. The sheet prints rounded figures, so each check's tolerance is half a unit
// of the last printed digit (toBeCloseTo(x, d) passes when |actual - x| < 0.5 × 10^-d).
import { describe, expect, it } from 'vitest';
import {
  airFreeCoFromCo2,
  airFreeCoFromO2,
  analyseFlueGas,
  co2FromO2,
  co2MaxFromComposition,
  coCo2Ratio,
  excessAirPct,
  flueLossPct,
  heatInputKw,
  lambdaFromO2,
} from '../../../lib/combustion';

describe('worked example 1: natural-gas boiler (CO 120 ppm, CO2 8.9 %, O2 5.2 %, flue 180 °C, air 18 °C, CO2max 11.7)', () => {
  it('CO/CO2 ratio 0.00135 ± 0.000005 (BS 7967 ratio method)', () => {
    expect(coCo2Ratio(120, 8.9)).toBeCloseTo(0.00135, 5);
  });

  it('air-free CO 160 ± 0.5 ppm by the O2 route (US field practice, ANSI Z21 limits)', () => {
    expect(airFreeCoFromO2(120, 5.2)).toBeCloseTo(160, 0);
  });

  it('air-free CO 158 ± 0.5 ppm by the CO2 route (ANSI Z21 ultimate-CO2 method)', () => {
    expect(airFreeCoFromCo2(120, 8.9, 11.7)).toBeCloseTo(158, 0);
  });

  it('CO2 from O2 8.79 ± 0.005 % (EN 50379-2 / standard practice)', () => {
    expect(co2FromO2(5.2, 11.7)).toBeCloseTo(8.79, 2);
  });

  it('lambda 1.331 ± 0.0005 and excess air 33.1 ± 0.05 % (field forms, practice)', () => {
    expect(lambdaFromO2(5.2)).toBeCloseTo(1.331, 3);
    expect(excessAirPct(5.2)).toBeCloseTo(33.1, 1);
  });

  it('Siegert flue loss 8.23 ± 0.005 % (1. BImSchV Siegert, natural-gas constants)', () => {
    expect(flueLossPct({ fuel: 'natural-gas', flueTempC: 180, airTempC: 18, o2Pct: 5.2 })).toBeCloseTo(8.23, 2);
  });

  it('analyseFlueGas gives the same figures with no warnings', () => {
    const result = analyseFlueGas({
      fuel: 'natural-gas',
      coPpm: 120,
      co2Pct: 8.9,
      o2Pct: 5.2,
      flueTempC: 180,
      airTempC: 18,
      co2MaxPct: 11.7,
    });
    expect(result.ratio).toBeCloseTo(0.00135, 5);
    expect(result.coAirFreeFromO2Ppm).toBeCloseTo(160, 0);
    expect(result.coAirFreeFromCo2Ppm).toBeCloseTo(158, 0);
    expect(result.co2FromO2Pct).toBeCloseTo(8.79, 2);
    expect(result.lambda).toBeCloseTo(1.331, 3);
    expect(result.excessAirPct).toBeCloseTo(33.1, 1);
    expect(result.flueLossPct).toBeCloseTo(8.23, 2);
    expect(result.netEfficiencyPct).toBeCloseTo(91.77, 2);
    expect(result.warnings).toEqual([]);
  });
});

describe('worked example 2: 20 kW oil boiler (flue 210 °C, air 15 °C, O2 4.0 %, CO 40 ppm)', () => {
  it('Siegert flue loss 195 × (0.68 / 17 + 0.007) = 9.165 %, printed as 9.17 (1. BImSchV Siegert, heating-oil constants)', () => {
    const lossPct = flueLossPct({ fuel: 'gas-oil', flueTempC: 210, airTempC: 15, o2Pct: 4 });
    // Tolerance 1e-9: the exact value is 9.165, which the sheet rounds half up.
    expect(lossPct).toBeCloseTo(9.165, 9);
    // 1. BImSchV §10: 11 % limit for 4–25 kW.
    expect(lossPct).toBeLessThan(11);
  });

  it('air-free CO 49 ± 0.5 ppm by the O2 route (US field practice)', () => {
    expect(airFreeCoFromO2(40, 4)).toBeCloseTo(49, 0);
  });
});

describe('worked example 3: gas oven (CO 150 ppm, O2 14.0 %, CO2 3.9 %)', () => {
  it('CO/CO2 ratio 0.0038 ± 0.00005 (BS 7967 ratio method)', () => {
    expect(coCo2Ratio(150, 3.9)).toBeCloseTo(0.0038, 4);
  });

  it('air-free CO 454 ± 0.5 ppm (O2 route) and 450 ± 0.5 ppm (CO2 route, CO2max 11.7), under the ANSI Z21.1 800 ppm', () => {
    const fromO2 = airFreeCoFromO2(150, 14);
    const fromCo2 = airFreeCoFromCo2(150, 3.9, 11.7);
    expect(fromO2).toBeCloseTo(454, 0);
    expect(fromCo2).toBeCloseTo(450, 0);
    expect(Math.max(fromO2, fromCo2)).toBeLessThan(800);
  });
});

describe('worked example 4: meter test (trade practice, gross/net from fuel property tables)', () => {
  it('0.050 m3 in 72 s at 39.5 MJ/m3 gives 2.50 m3/h, 27.43 ± 0.005 kW gross, 24.71 ± 0.005 kW net', () => {
    const result = heatInputKw({
      fuel: 'natural-gas',
      volume: 0.05,
      volumeUnit: 'm3',
      seconds: 72,
      calorificValue: 39.5,
      cvUnit: 'MJ/m3',
    });
    expect(result.gasRateUnit).toBe('m3/h');
    expect(result.gasRate).toBeCloseTo(2.5, 9);
    expect(result.grossKw).toBeCloseTo(27.43, 2);
    expect(result.netKw).toBeCloseTo(24.71, 2);
  });

  it('1 ft3 in 40 s at 1040 Btu/ft3 gives 90 ft3/h, 93 600 Btu/h, 27.43 ± 0.005 kW gross', () => {
    const result = heatInputKw({
      fuel: 'natural-gas',
      volume: 1,
      volumeUnit: 'ft3',
      seconds: 40,
      calorificValue: 1040,
      cvUnit: 'Btu/ft3',
    });
    expect(result.gasRateUnit).toBe('ft3/h');
    expect(result.gasRate).toBeCloseTo(90, 9);
    // Btu/h is not returned; kW × 3412.14 gives it back (tolerance ± 0.5 Btu/h).
    expect(result.grossKw * 3412.14).toBeCloseTo(93_600, 0);
    expect(result.grossKw).toBeCloseTo(27.43, 2);
  });
});

describe('worked example 5: CO2max from composition (stoichiometry)', () => {
  it('91 % CH4, 5 % C2H6, 1 % C3H8, 2 % N2, 1 % CO2 gives 11.95 ± 0.005 %', () => {
    expect(co2MaxFromComposition({ CH4: 0.91, C2H6: 0.05, C3H8: 0.01, N2: 0.02, CO2: 0.01 })).toBeCloseTo(11.95, 2);
  });
});
