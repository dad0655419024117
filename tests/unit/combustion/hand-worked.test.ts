// Further cases worked by hand from the published formulas in the reference sheet; each title names
// the source of the formula. Inputs are chosen so the arithmetic comes out round enough to check
// by hand, and tolerances are tight (toBeCloseTo(x, d): |actual - x| < 0.5 × 10^-d).
import { describe, expect, it } from 'vitest';
import {
  airFreeCoFromCo2,
  airFreeCoFromO2,
  cToF,
  co2FromO2,
  co2MaxFromComposition,
  coCo2Ratio,
  excessAirPct,
  fToC,
  flueLossPct,
  heatInputKw,
  lambdaFromO2,
  ppmToMgPerM3,
} from '../../../lib/combustion';

describe('CO/CO2 ratio (BS 7967 ratio method)', () => {
  it('350 ppm at 9.5 % CO2: 0.035 / 9.5 = 0.0036842 (under the 0.004 trade guidance for condensing boilers)', () => {
    const ratio = coCo2Ratio(350, 9.5);
    expect(ratio).toBeCloseTo(0.0036842, 7);
    expect(ratio).toBeLessThan(0.004);
  });

  it('800 ppm at 10 % CO2: 0.08 / 10 = 0.008 exactly', () => {
    expect(coCo2Ratio(800, 10)).toBeCloseTo(0.008, 12);
  });

  it('no CO gives a ratio of 0', () => {
    expect(coCo2Ratio(0, 10)).toBe(0);
  });
});

describe('air-free CO (O2 route: US field practice; CO2 route: ANSI Z21 ultimate CO2)', () => {
  it('O2 route: 50 ppm at 10.45 % O2 is 50 × 20.9 / 10.45 = 100 ppm', () => {
    expect(airFreeCoFromO2(50, 10.45)).toBeCloseTo(100, 9);
  });

  it('O2 route: an undiluted sample (0 % O2) is already air-free', () => {
    expect(airFreeCoFromO2(100, 0)).toBe(100);
  });

  it('CO2 route: 200 ppm at 5.85 % CO2 with CO2max 11.7 is 200 × 2 = 400 ppm', () => {
    expect(airFreeCoFromCo2(200, 5.85, 11.7)).toBeCloseTo(400, 9);
  });
});

describe('CO2 from O2 (EN 50379-2 / standard practice)', () => {
  it('half the air (10.45 % O2) halves CO2max: 11.7 → 5.85 %', () => {
    expect(co2FromO2(10.45, 11.7)).toBeCloseTo(5.85, 12);
  });

  it('0 % O2 gives CO2max itself (gas oil 15.4 %)', () => {
    expect(co2FromO2(0, 15.4)).toBeCloseTo(15.4, 12);
  });
});

describe('lambda and excess air (field forms, practice)', () => {
  it('10.45 % O2: lambda 20.9 / 10.45 = 2, excess air 100 × 10.45 / 10.45 = 100 %', () => {
    expect(lambdaFromO2(10.45)).toBeCloseTo(2, 12);
    expect(excessAirPct(10.45)).toBeCloseTo(100, 10);
  });

  it('0 % O2: lambda 1, excess air 0 %', () => {
    expect(lambdaFromO2(0)).toBe(1);
    expect(excessAirPct(0)).toBe(0);
  });

  it('3 % O2: lambda 20.9 / 17.9 = 1.167598, excess air 300 / 17.9 = 16.759777 %', () => {
    expect(lambdaFromO2(3)).toBeCloseTo(1.167598, 6);
    expect(excessAirPct(3)).toBeCloseTo(16.759777, 6);
  });
});

describe('Siegert flue loss (1. BImSchV Siegert)', () => {
  it('propane, LPG constants: 130 × (0.63 / 15 + 0.008) = 130 × 0.05 = 6.5 %', () => {
    expect(flueLossPct({ fuel: 'propane', flueTempC: 150, airTempC: 20, o2Pct: 6 })).toBeCloseTo(6.5, 10);
  });

  it('butane uses the LPG constants too: 100 × (0.63 / 21 + 0.008) = 3.8 %', () => {
    expect(flueLossPct({ fuel: 'butane', flueTempC: 100, airTempC: 0, o2Pct: 0 })).toBeCloseTo(3.8, 10);
  });

  it('natural gas: 100 × (0.66 / 11 + 0.009) = 100 × 0.069 = 6.9 %', () => {
    expect(flueLossPct({ fuel: 'natural-gas', flueTempC: 120, airTempC: 20, o2Pct: 10 })).toBeCloseTo(6.9, 10);
  });

  it('kerosene, heating-oil constants: 240 × (0.68 / 17 + 0.007) = 11.28 %, over the 11 % limit for 4–25 kW (1. BImSchV §10)', () => {
    const lossPct = flueLossPct({ fuel: 'kerosene', flueTempC: 250, airTempC: 10, o2Pct: 4 });
    expect(lossPct).toBeCloseTo(11.28, 10);
    expect(lossPct).toBeGreaterThan(11);
  });

  it('flue at air temperature loses nothing', () => {
    expect(flueLossPct({ fuel: 'gas-oil', flueTempC: 20, airTempC: 20, o2Pct: 3 })).toBe(0);
  });
});

describe('heat input from a meter test (trade practice; conversions 1 m3 = 35.3147 ft3, 1 MJ = 947.817 Btu, 1 kW = 3412.14 Btu/h)', () => {
  it('propane 0.01 m3 in 36 s at 93 MJ/m3: 1 m3/h, 93 / 3.6 = 25.83333 kW gross, / 1.09 = 23.70031 kW net', () => {
    const result = heatInputKw({
      fuel: 'propane',
      volume: 0.01,
      volumeUnit: 'm3',
      seconds: 36,
      calorificValue: 93,
      cvUnit: 'MJ/m3',
    });
    expect(result.gasRate).toBeCloseTo(1, 12);
    expect(result.grossKw).toBeCloseTo(25.83333, 5);
    expect(result.netKw).toBeCloseTo(23.70031, 5);
  });

  it('metric meter, imperial CV: 0.1 m3 in 360 s at 1000 Btu/ft3 is 35 314.7 Btu/h = 10.34972 kW gross, / 1.11 = 9.32407 kW net', () => {
    const result = heatInputKw({
      fuel: 'natural-gas',
      volume: 0.1,
      volumeUnit: 'm3',
      seconds: 360,
      calorificValue: 1000,
      cvUnit: 'Btu/ft3',
    });
    expect(result.gasRateUnit).toBe('m3/h');
    expect(result.gasRate).toBeCloseTo(1, 12);
    expect(result.grossKw).toBeCloseTo(10.34972, 5);
    expect(result.netKw).toBeCloseTo(9.32407, 5);
  });

  it('imperial meter, metric CV: 1 ft3 in 36 s at 37.5 MJ/m3 is 100 ft3/h = 2.831685 m3/h, × 37.5 / 3.6 = 29.49672 kW gross', () => {
    const result = heatInputKw({
      fuel: 'natural-gas',
      volume: 1,
      volumeUnit: 'ft3',
      seconds: 36,
      calorificValue: 37.5,
      cvUnit: 'MJ/m3',
    });
    expect(result.gasRateUnit).toBe('ft3/h');
    expect(result.gasRate).toBeCloseTo(100, 10);
    expect(result.grossKw).toBeCloseTo(29.49672, 4);
  });

  it('gas oil uses the approximate 1.06 gross/net ratio (fuel property tables)', () => {
    const result = heatInputKw({
      fuel: 'gas-oil',
      volume: 0.001,
      volumeUnit: 'm3',
      seconds: 360,
      calorificValue: 38_000,
      cvUnit: 'MJ/m3',
    });
    // 0.01 m3/h × 38 000 MJ/m3 / 3.6 = 105.5556 kW gross; / 1.06 = 99.5807 kW net.
    expect(result.grossKw).toBeCloseTo(105.5556, 4);
    expect(result.netKw).toBeCloseTo(99.5807, 4);
  });
});

describe('ppm to mg/m3 (ideal gas law; CO M = 28.01 g/mol)', () => {
  it('1 ppm CO at 25 °C, 101.325 kPa: 28.01 / 24.465 = 1.14490 mg/m3', () => {
    expect(ppmToMgPerM3(1, 28.01)).toBeCloseTo(1.1449, 4);
  });

  it('9 ppm CO (US EPA 8-h NAAQS) is about 10.30 mg/m3 at 25 °C, matching the WHO 10 mg/m3 8-h figure (from memory) to within 5 %', () => {
    const mgPerM3 = ppmToMgPerM3(9, 28.01);
    expect(mgPerM3).toBeCloseTo(10.304, 3);
    expect(Math.abs(mgPerM3 - 10) / 10).toBeLessThan(0.05);
  });

  it('at 0 °C, Vm = 22.414 L/mol, so 1 ppm CO is 1.2497 mg/m3 (the familiar 1.25, from memory)', () => {
    expect(ppmToMgPerM3(1, 28.01, 0)).toBeCloseTo(1.2497, 4);
  });

  it('halving the pressure halves the mass concentration', () => {
    expect(ppmToMgPerM3(100, 28.01, 25, 50.6625)).toBeCloseTo(ppmToMgPerM3(100, 28.01) / 2, 10);
  });
});

describe('temperature conversion (definition of the scales)', () => {
  it('212 °F = 100 °C, 32 °F = 0 °C', () => {
    expect(fToC(212)).toBeCloseTo(100, 12);
    expect(fToC(32)).toBe(0);
  });

  it('-40 °C = -40 °F, 37 °C = 98.6 °F', () => {
    expect(cToF(-40)).toBeCloseTo(-40, 12);
    expect(cToF(37)).toBeCloseTo(98.6, 12);
  });
});

describe('CO2max from composition (stoichiometry)', () => {
  it('ethane: 2 / (2 + 3.773 × 3.5) = 13.1531 %', () => {
    expect(co2MaxFromComposition({ C2H6: 1 })).toBeCloseTo(13.1531, 4);
  });

  it('90 % CH4 with 10 % N2: 0.9 / (0.9 + 0.1 + 3.773 × 1.8) = 11.5512 %', () => {
    expect(co2MaxFromComposition({ CH4: 0.9, N2: 0.1 })).toBeCloseTo(11.5512, 4);
  });

  it('fractions summing to 0.996 give the same answer as the normalised mix (the formula does not depend on scale)', () => {
    expect(co2MaxFromComposition({ CH4: 0.896, N2: 0.1 })).toBeCloseTo(
      co2MaxFromComposition({ CH4: 0.896 / 0.996, N2: 0.1 / 0.996 }),
      10,
    );
  });
});
