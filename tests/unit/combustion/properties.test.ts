// Property tests (fast-check, 1000 runs each) for what must hold for every valid input,
// following from the formulas in the reference sheet.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  airFreeCoFromCo2,
  airFreeCoFromO2,
  analyseFlueGas,
  cToF,
  co2FromO2,
  co2MaxForFuel,
  co2MaxFromComposition,
  coCo2Ratio,
  excessAirPct,
  fToC,
  flueLossPct,
  heatInputKw,
  lambdaFromO2,
  ppmToMgPerM3,
} from '../../../lib/combustion';
import { RANGES, fuel, within } from './arbitraries';

const RUNS = { numRuns: 1000 };

/** |a − b| within a relative tolerance, with a tiny absolute floor for values near zero. */
function expectRelativelyClose(actual: number, expected: number, relative: number): void {
  const scale = Math.max(Math.abs(actual), Math.abs(expected));
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(relative * scale + 1e-12);
}

function expectAllFinite(values: unknown[]): void {
  for (const value of values) {
    expect(typeof value).toBe('number');
    expect(Number.isFinite(value)).toBe(true);
  }
}

describe('dilution with air', () => {
  // Diluting a sample with fresh air keeps a fraction d of the flue gas: CO and CO2 scale by d,
  // and O2 moves toward 20.9 as 20.9 − d × (20.9 − O2). Air's own CO2 (0.04 %) is ignored.
  const sample = fc.record({
    coPpm: fc.double({ min: 0, max: 100_000, noNaN: true }),
    co2Pct: fc.double({ min: 1, max: 30, noNaN: true }),
    o2Pct: fc.double({ min: 0, max: 15, noNaN: true }),
    keptFraction: fc.double({ min: 0.01, max: 1, noNaN: true }),
  });

  it('does not change the CO/CO2 ratio, and moves O2 toward 20.9 (BS 7967 ratio method)', () => {
    fc.assert(
      fc.property(sample, ({ coPpm, co2Pct, o2Pct, keptFraction }) => {
        const dilutedO2Pct = 20.9 - keptFraction * (20.9 - o2Pct);
        // 1e-12 allows for rounding in this line's own arithmetic.
        expect(dilutedO2Pct).toBeGreaterThanOrEqual(o2Pct - 1e-12);
        expect(dilutedO2Pct).toBeLessThan(20.9);
        expectRelativelyClose(coCo2Ratio(coPpm * keptFraction, co2Pct * keptFraction), coCo2Ratio(coPpm, co2Pct), 1e-12);
      }),
      RUNS,
    );
  });

  it('does not change air-free CO by either route (US field practice; ANSI Z21 ultimate CO2)', () => {
    fc.assert(
      fc.property(sample, fc.double({ min: 5, max: 30, noNaN: true }), ({ coPpm, co2Pct, o2Pct, keptFraction }, co2MaxPct) => {
        const dilutedO2Pct = 20.9 - keptFraction * (20.9 - o2Pct);
        expectRelativelyClose(airFreeCoFromO2(coPpm * keptFraction, dilutedO2Pct), airFreeCoFromO2(coPpm, o2Pct), 1e-9);
        expectRelativelyClose(
          airFreeCoFromCo2(coPpm * keptFraction, co2Pct * keptFraction, co2MaxPct),
          airFreeCoFromCo2(coPpm, co2Pct, co2MaxPct),
          1e-12,
        );
      }),
      RUNS,
    );
  });
});

describe('air-free CO is never below the CO measured', () => {
  it('by the O2 route, for any valid O2', () => {
    fc.assert(
      fc.property(within(RANGES.coPpm), within(RANGES.o2Pct), (coPpm, o2Pct) => {
        expect(airFreeCoFromO2(coPpm, o2Pct)).toBeGreaterThanOrEqual(coPpm);
      }),
      RUNS,
    );
  });

  it('by the CO2 route, whenever measured CO2 is at or below CO2max', () => {
    const co2Pair = fc
      .tuple(within(RANGES.co2Pct), within(RANGES.co2Pct))
      .map(([a, b]) => ({ co2Pct: Math.min(a, b), co2MaxPct: Math.max(a, b) }));
    fc.assert(
      fc.property(within(RANGES.coPpm), co2Pair, (coPpm, { co2Pct, co2MaxPct }) => {
        expect(airFreeCoFromCo2(coPpm, co2Pct, co2MaxPct)).toBeGreaterThanOrEqual(coPpm);
      }),
      RUNS,
    );
  });
});

describe('the two routes to air-free CO agree', () => {
  it('for an undiluted consistent sample, where CO2 = co2FromO2(O2)', () => {
    fc.assert(
      fc.property(
        within(RANGES.coPpm),
        fc.double({ min: 0, max: 20.8, noNaN: true }),
        fc.double({ min: 5, max: 30, noNaN: true }),
        (coPpm, o2Pct, co2MaxPct) => {
          const co2Pct = co2FromO2(o2Pct, co2MaxPct);
          expectRelativelyClose(airFreeCoFromCo2(coPpm, co2Pct, co2MaxPct), airFreeCoFromO2(coPpm, o2Pct), 1e-9);
        },
      ),
      RUNS,
    );
  });
});

describe('no NaN or Infinity from any valid input', () => {
  it('coCo2Ratio', () => {
    fc.assert(
      fc.property(within(RANGES.coPpm), within(RANGES.co2Pct), (coPpm, co2Pct) => {
        expectAllFinite([coCo2Ratio(coPpm, co2Pct)]);
      }),
      RUNS,
    );
  });

  it('airFreeCoFromO2, co2FromO2, lambdaFromO2, excessAirPct', () => {
    fc.assert(
      fc.property(within(RANGES.coPpm), within(RANGES.o2Pct), within(RANGES.co2MaxPct), (coPpm, o2Pct, co2MaxPct) => {
        expectAllFinite([airFreeCoFromO2(coPpm, o2Pct), co2FromO2(o2Pct, co2MaxPct), lambdaFromO2(o2Pct), excessAirPct(o2Pct)]);
      }),
      RUNS,
    );
  });

  it('airFreeCoFromCo2', () => {
    fc.assert(
      fc.property(within(RANGES.coPpm), within(RANGES.co2Pct), within(RANGES.co2MaxPct), (coPpm, co2Pct, co2MaxPct) => {
        expectAllFinite([airFreeCoFromCo2(coPpm, co2Pct, co2MaxPct)]);
      }),
      RUNS,
    );
  });

  it('co2MaxForFuel and co2MaxFromComposition (and the result is a percentage)', () => {
    const composition = fc
      .record({
        CH4: fc.double({ min: 0.01, max: 1, noNaN: true }),
        C2H6: fc.double({ min: 0, max: 1, noNaN: true }),
        C3H8: fc.double({ min: 0, max: 1, noNaN: true }),
        C4H10: fc.double({ min: 0, max: 1, noNaN: true }),
        N2: fc.double({ min: 0, max: 1, noNaN: true }),
        CO2: fc.double({ min: 0, max: 1, noNaN: true }),
      })
      .map((raw) => {
        const total = Object.values(raw).reduce((sum, x) => sum + x, 0);
        return Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, v / total]));
      });
    fc.assert(
      fc.property(fuel(), composition, (fuelId, moleFractions) => {
        const fromComposition = co2MaxFromComposition(moleFractions);
        expectAllFinite([co2MaxForFuel(fuelId), fromComposition]);
        expect(fromComposition).toBeGreaterThan(0);
        expect(fromComposition).toBeLessThanOrEqual(100);
      }),
      RUNS,
    );
  });

  it('flueLossPct (and it is never negative)', () => {
    const temps = fc
      .tuple(within(RANGES.tempC), within(RANGES.tempC))
      .map(([a, b]) => ({ airTempC: Math.min(a, b), flueTempC: Math.max(a, b) }));
    fc.assert(
      fc.property(fuel(), temps, within(RANGES.o2Pct), (fuelId, { airTempC, flueTempC }, o2Pct) => {
        const lossPct = flueLossPct({ fuel: fuelId, flueTempC, airTempC, o2Pct });
        expectAllFinite([lossPct]);
        expect(lossPct).toBeGreaterThanOrEqual(0);
      }),
      RUNS,
    );
  });

  it('heatInputKw (and net never exceeds gross)', () => {
    fc.assert(
      fc.property(
        fuel(),
        within(RANGES.volume),
        fc.constantFrom('m3' as const, 'ft3' as const),
        within(RANGES.seconds),
        within(RANGES.calorificValue),
        fc.constantFrom('MJ/m3' as const, 'Btu/ft3' as const),
        (fuelId, volume, volumeUnit, seconds, calorificValue, cvUnit) => {
          const result = heatInputKw({ fuel: fuelId, volume, volumeUnit, seconds, calorificValue, cvUnit });
          expectAllFinite([result.gasRate, result.grossKw, result.netKw]);
          expect(result.netKw).toBeLessThanOrEqual(result.grossKw);
          expect(result.gasRateUnit).toBe(volumeUnit === 'm3' ? 'm3/h' : 'ft3/h');
        },
      ),
      RUNS,
    );
  });

  it('ppmToMgPerM3, fToC, cToF', () => {
    fc.assert(
      fc.property(
        within(RANGES.ppm),
        within(RANGES.molarMassGPerMol),
        within(RANGES.tempC),
        within(RANGES.pressureKPa),
        within(RANGES.tempF),
        (ppm, molarMass, tempC, pressureKPa, tempF) => {
          expectAllFinite([ppmToMgPerM3(ppm, molarMass, tempC, pressureKPa), ppmToMgPerM3(ppm, molarMass), fToC(tempF), cToF(tempC)]);
        },
      ),
      RUNS,
    );
  });

  it('analyseFlueGas, with every field computed exactly as the single functions compute it', () => {
    const optional = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });
    fc.assert(
      fc.property(
        fuel(),
        within(RANGES.coPpm),
        optional(within(RANGES.co2Pct)),
        optional(within(RANGES.o2Pct)),
        optional(within(RANGES.tempC)),
        optional(within(RANGES.tempC)),
        optional(within(RANGES.co2MaxPct)),
        (fuelId, coPpm, co2Pct, o2Pct, flueTempC, airTempC, co2MaxPct) => {
          const result = analyseFlueGas({ fuel: fuelId, coPpm, co2Pct, o2Pct, flueTempC, airTempC, co2MaxPct });
          const max = co2MaxPct ?? co2MaxForFuel(fuelId);
          expect(result.co2MaxPct).toBe(max);
          expect(result.ratio).toBe(co2Pct === undefined ? null : coCo2Ratio(coPpm, co2Pct));
          expect(result.coAirFreeFromCo2Ppm).toBe(co2Pct === undefined ? null : airFreeCoFromCo2(coPpm, co2Pct, max));
          expect(result.coAirFreeFromO2Ppm).toBe(o2Pct === undefined ? null : airFreeCoFromO2(coPpm, o2Pct));
          expect(result.co2FromO2Pct).toBe(o2Pct === undefined ? null : co2FromO2(o2Pct, max));
          expect(result.lambda).toBe(o2Pct === undefined ? null : lambdaFromO2(o2Pct));
          expect(result.excessAirPct).toBe(o2Pct === undefined ? null : excessAirPct(o2Pct));
          const lossComputable =
            o2Pct !== undefined && flueTempC !== undefined && airTempC !== undefined && flueTempC >= airTempC;
          expect(result.flueLossPct).toBe(
            lossComputable ? flueLossPct({ fuel: fuelId, flueTempC, airTempC, o2Pct }) : null,
          );
          expect(result.netEfficiencyPct).toBe(result.flueLossPct === null ? null : 100 - result.flueLossPct);
          const inverted = flueTempC !== undefined && airTempC !== undefined && flueTempC < airTempC;
          expect(result.warnings.some((w) => w.code === 'temperature_inverted')).toBe(inverted);
          const numbers = [
            result.co2MaxPct,
            result.coPpm,
            result.ratio,
            result.coAirFreeFromO2Ppm,
            result.coAirFreeFromCo2Ppm,
            result.co2FromO2Pct,
            result.lambda,
            result.excessAirPct,
            result.flueLossPct,
            result.netEfficiencyPct,
          ].filter((x) => x !== null);
          expectAllFinite(numbers);
        },
      ),
      RUNS,
    );
  });
});

describe('CO2 from O2', () => {
  it('lies between 0 and CO2max, and falls as O2 rises (EN 50379-2 / standard practice)', () => {
    fc.assert(
      fc.property(within(RANGES.o2Pct), within(RANGES.o2Pct), within(RANGES.co2MaxPct), (a, b, co2MaxPct) => {
        const [lowO2, highO2] = a <= b ? [a, b] : [b, a];
        const atLow = co2FromO2(lowO2, co2MaxPct);
        expect(atLow).toBeLessThanOrEqual(co2MaxPct);
        expect(co2FromO2(highO2, co2MaxPct)).toBeGreaterThanOrEqual(0);
        expect(co2FromO2(highO2, co2MaxPct)).toBeLessThanOrEqual(atLow);
      }),
      RUNS,
    );
  });
});

describe('round trips', () => {
  it('cToF then fToC gives back the temperature', () => {
    fc.assert(
      fc.property(within(RANGES.tempC), (tempC) => {
        expect(fToC(cToF(tempC))).toBeCloseTo(tempC, 9);
      }),
      RUNS,
    );
  });

  it('the same gas rate and CV in either unit system give the same kW within 1e-5 relative (conversion factors are rounded)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.001, max: 10, noNaN: true }),
        fc.double({ min: 1, max: 3600, noNaN: true }),
        fc.double({ min: 10, max: 120, noNaN: true }),
        (volumeM3, seconds, cvMjPerM3) => {
          const metric = heatInputKw({
            fuel: 'natural-gas',
            volume: volumeM3,
            volumeUnit: 'm3',
            seconds,
            calorificValue: cvMjPerM3,
            cvUnit: 'MJ/m3',
          });
          const imperial = heatInputKw({
            fuel: 'natural-gas',
            volume: volumeM3 * 35.3147,
            volumeUnit: 'ft3',
            seconds,
            calorificValue: (cvMjPerM3 * 947.817) / 35.3147,
            cvUnit: 'Btu/ft3',
          });
          expectRelativelyClose(imperial.grossKw, metric.grossKw, 1e-5);
        },
      ),
      RUNS,
    );
  });
});
