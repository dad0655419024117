// Every kind of invalid input throws CombustionInputError naming the offending field: one example
// per kind to show the message, then a 1000-run property per function and field.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  CombustionInputError,
  FUEL_IDS,
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
  type CombustionInputField,
} from '../../../lib/combustion';
import { RANGES, fuel, invalidFor, notOneOf, within, type Range } from './arbitraries';

const RUNS = { numRuns: 1000 };

function thrown(call: () => unknown): unknown {
  try {
    call();
  } catch (error) {
    return error;
  }
  return undefined;
}

function expectInputError(call: () => unknown, field: CombustionInputField): CombustionInputError {
  const error = thrown(call);
  expect(error).toBeInstanceOf(CombustionInputError);
  expect(error).toBeInstanceOf(Error);
  const inputError = error as CombustionInputError;
  expect(inputError.name).toBe('CombustionInputError');
  expect(inputError.field).toBe(field);
  return inputError;
}

// Loose call signatures so tests can pass values the types would forbid, as callers using `as any` could.
type Args = Record<string, unknown>;
type LooseFn = (...args: unknown[]) => unknown;
const loose = <F>(fn: F) => fn as unknown as LooseFn;

interface FieldSpec {
  valid: fc.Arbitrary<unknown>;
  invalid: fc.Arbitrary<unknown>;
}

interface Case {
  name: string;
  fields: Record<string, FieldSpec>;
  call: (args: Args) => unknown;
}

const numberField = (range: Range): FieldSpec => ({ valid: within(range), invalid: invalidFor(range) });
const fuelField: FieldSpec = { valid: fuel(), invalid: notOneOf(FUEL_IDS) };

const cases: Case[] = [
  {
    name: 'coCo2Ratio',
    fields: { coPpm: numberField(RANGES.coPpm), co2Pct: numberField(RANGES.co2Pct) },
    call: (a) => loose(coCo2Ratio)(a.coPpm, a.co2Pct),
  },
  {
    name: 'airFreeCoFromO2',
    fields: { coPpm: numberField(RANGES.coPpm), o2Pct: numberField(RANGES.o2Pct) },
    call: (a) => loose(airFreeCoFromO2)(a.coPpm, a.o2Pct),
  },
  {
    name: 'airFreeCoFromCo2',
    fields: {
      coPpm: numberField(RANGES.coPpm),
      co2Pct: numberField(RANGES.co2Pct),
      co2MaxPct: numberField(RANGES.co2MaxPct),
    },
    call: (a) => loose(airFreeCoFromCo2)(a.coPpm, a.co2Pct, a.co2MaxPct),
  },
  {
    name: 'co2FromO2',
    fields: { o2Pct: numberField(RANGES.o2Pct), co2MaxPct: numberField(RANGES.co2MaxPct) },
    call: (a) => loose(co2FromO2)(a.o2Pct, a.co2MaxPct),
  },
  { name: 'lambdaFromO2', fields: { o2Pct: numberField(RANGES.o2Pct) }, call: (a) => loose(lambdaFromO2)(a.o2Pct) },
  { name: 'excessAirPct', fields: { o2Pct: numberField(RANGES.o2Pct) }, call: (a) => loose(excessAirPct)(a.o2Pct) },
  { name: 'co2MaxForFuel', fields: { fuel: fuelField }, call: (a) => loose(co2MaxForFuel)(a.fuel) },
  {
    // Temperatures are checked one at a time here; their order is a separate test below.
    name: 'flueLossPct',
    fields: {
      fuel: fuelField,
      flueTempC: numberField(RANGES.tempC),
      airTempC: numberField(RANGES.tempC),
      o2Pct: numberField(RANGES.o2Pct),
    },
    call: (a) => loose(flueLossPct)(a),
  },
  {
    name: 'heatInputKw',
    fields: {
      fuel: fuelField,
      volume: numberField(RANGES.volume),
      volumeUnit: { valid: fc.constantFrom('m3', 'ft3'), invalid: notOneOf(['m3', 'ft3']) },
      seconds: numberField(RANGES.seconds),
      calorificValue: numberField(RANGES.calorificValue),
      cvUnit: { valid: fc.constantFrom('MJ/m3', 'Btu/ft3'), invalid: notOneOf(['MJ/m3', 'Btu/ft3']) },
    },
    call: (a) => loose(heatInputKw)(a),
  },
  {
    name: 'ppmToMgPerM3',
    fields: {
      ppm: numberField(RANGES.ppm),
      molarMassGPerMol: numberField(RANGES.molarMassGPerMol),
      // undefined means "use the default" for these two, so it is not invalid.
      tempC: { valid: within(RANGES.tempC), invalid: invalidFor(RANGES.tempC, { includeMissing: false }) },
      pressureKPa: {
        valid: within(RANGES.pressureKPa),
        invalid: invalidFor(RANGES.pressureKPa, { includeMissing: false }).filter((v) => v !== undefined),
      },
    },
    call: (a) => loose(ppmToMgPerM3)(a.ppm, a.molarMassGPerMol, a.tempC, a.pressureKPa),
  },
  { name: 'fToC', fields: { tempF: numberField(RANGES.tempF) }, call: (a) => loose(fToC)(a.tempF) },
  { name: 'cToF', fields: { tempC: numberField(RANGES.tempC) }, call: (a) => loose(cToF)(a.tempC) },
  {
    // Optional readings may be missing (undefined or null); anything else invalid throws.
    name: 'analyseFlueGas',
    fields: {
      fuel: fuelField,
      coPpm: numberField(RANGES.coPpm),
      co2Pct: { valid: within(RANGES.co2Pct), invalid: invalidFor(RANGES.co2Pct, { includeMissing: false }) },
      o2Pct: { valid: within(RANGES.o2Pct), invalid: invalidFor(RANGES.o2Pct, { includeMissing: false }) },
      flueTempC: { valid: within(RANGES.tempC), invalid: invalidFor(RANGES.tempC, { includeMissing: false }) },
      airTempC: { valid: within(RANGES.tempC), invalid: invalidFor(RANGES.tempC, { includeMissing: false }) },
      co2MaxPct: { valid: within(RANGES.co2MaxPct), invalid: invalidFor(RANGES.co2MaxPct, { includeMissing: false }) },
    },
    call: (a) => loose(analyseFlueGas)(a),
  },
];

describe('invalid input: examples with their messages', () => {
  it('O2 at 21 % names o2Pct and states the range', () => {
    const error = expectInputError(() => airFreeCoFromO2(100, 21), 'o2Pct');
    expect(error.message).toBe('o2Pct must be a number from 0 to below 20.9 (got 21)');
  });

  it('O2 of exactly 20.9 % is rejected: the air-free formulas divide by zero there', () => {
    expectInputError(() => lambdaFromO2(20.9), 'o2Pct');
    expectInputError(() => excessAirPct(20.9), 'o2Pct');
    expectInputError(() => airFreeCoFromO2(10, 20.9), 'o2Pct');
    expectInputError(() => co2FromO2(20.9, 11.7), 'o2Pct');
  });

  it('negative CO names coPpm', () => {
    expect(expectInputError(() => coCo2Ratio(-1, 9), 'coPpm').message).toBe(
      'coPpm must be a number from 0 to 1000000 (got -1)',
    );
  });

  it('zero CO2 names co2Pct; CO2 above 30 % too', () => {
    expect(expectInputError(() => coCo2Ratio(100, 0), 'co2Pct').message).toBe(
      'co2Pct must be a number from 0.01 to 30 (got 0)',
    );
    expectInputError(() => airFreeCoFromCo2(100, 31, 11.7), 'co2Pct');
  });

  it('CO2max of 0 or above 30 names co2MaxPct', () => {
    expect(expectInputError(() => co2FromO2(5, 0), 'co2MaxPct').message).toBe(
      'co2MaxPct must be a number above 0 and at most 30 (got 0)',
    );
    expectInputError(() => airFreeCoFromCo2(100, 9, 30.5), 'co2MaxPct');
  });

  it('NaN, Infinity and numeric strings are rejected, and the message shows what came in', () => {
    expect(expectInputError(() => coCo2Ratio(Number.NaN, 9), 'coPpm').message).toContain('(got NaN)');
    expectInputError(() => coCo2Ratio(100, Number.POSITIVE_INFINITY), 'co2Pct');
    expect(expectInputError(() => loose(coCo2Ratio)('120', 8.9), 'coPpm').message).toContain('(got "120")');
  });

  it('temperatures outside -60..1500 °C are rejected', () => {
    expectInputError(() => flueLossPct({ fuel: 'natural-gas', flueTempC: 1501, airTempC: 20, o2Pct: 4 }), 'flueTempC');
    expectInputError(() => flueLossPct({ fuel: 'natural-gas', flueTempC: 150, airTempC: -61, o2Pct: 4 }), 'airTempC');
    expectInputError(() => cToF(-273.15), 'tempC');
    expectInputError(() => fToC(5000), 'tempF');
  });

  it('flueLossPct throws on a flue colder than the air, naming flueTempC', () => {
    const error = expectInputError(
      () => flueLossPct({ fuel: 'natural-gas', flueTempC: 15, airTempC: 20, o2Pct: 4 }),
      'flueTempC',
    );
    expect(error.message).toContain('airTempC');
  });

  it('an unknown fuel names fuel', () => {
    expect(expectInputError(() => loose(co2MaxForFuel)('lpg'), 'fuel').message).toContain('natural-gas');
    expectInputError(() => loose(co2MaxForFuel)('toString'), 'fuel');
  });

  it('meter test: seconds, volume and calorific value at or below 0 are rejected', () => {
    const base = {
      fuel: 'natural-gas' as const,
      volume: 0.05,
      volumeUnit: 'm3' as const,
      seconds: 72,
      calorificValue: 39.5,
      cvUnit: 'MJ/m3' as const,
    };
    expectInputError(() => heatInputKw({ ...base, seconds: 0 }), 'seconds');
    expectInputError(() => heatInputKw({ ...base, seconds: -5 }), 'seconds');
    expectInputError(() => heatInputKw({ ...base, volume: 0 }), 'volume');
    expectInputError(() => heatInputKw({ ...base, calorificValue: 0 }), 'calorificValue');
    expectInputError(() => loose(heatInputKw)({ ...base, volumeUnit: 'litre' }), 'volumeUnit');
    expectInputError(() => loose(heatInputKw)({ ...base, cvUnit: 'kWh/m3' }), 'cvUnit');
  });

  it('input objects that are not objects are rejected', () => {
    expectInputError(() => loose(flueLossPct)(null), 'input');
    expectInputError(() => loose(heatInputKw)(undefined), 'input');
    expectInputError(() => loose(analyseFlueGas)('co 120'), 'input');
  });

  it('mole fractions: wrong sum, out of range, unknown gas, nothing to burn, not an object', () => {
    expect(expectInputError(() => co2MaxFromComposition({ CH4: 0.9 }), 'moleFractions').message).toContain(
      'sum to 1 within 0.005',
    );
    expectInputError(() => co2MaxFromComposition({ CH4: 0.994 }), 'moleFractions');
    expectInputError(() => co2MaxFromComposition({ CH4: 1.2, N2: -0.2 }), 'moleFractions');
    expectInputError(() => co2MaxFromComposition({ CH4: Number.NaN }), 'moleFractions');
    expectInputError(() => loose(co2MaxFromComposition)({ CH4: 0.9, H2: 0.1 }), 'moleFractions');
    expectInputError(() => co2MaxFromComposition({ N2: 1 }), 'moleFractions');
    expectInputError(() => co2MaxFromComposition({ CO2: 1 }), 'moleFractions');
    expectInputError(() => loose(co2MaxFromComposition)(null), 'moleFractions');
    expectInputError(() => loose(co2MaxFromComposition)([1]), 'moleFractions');
  });

  it('mole fractions summing to 1 within 0.005 are accepted', () => {
    expect(Number.isFinite(co2MaxFromComposition({ CH4: 0.996 }))).toBe(true);
    expect(Number.isFinite(co2MaxFromComposition({ CH4: 1.004 - 0.004, C2H6: 0.004 }))).toBe(true);
  });
});

describe('invalid input: properties (one invalid field, all others valid)', () => {
  for (const testCase of cases) {
    for (const field of Object.keys(testCase.fields)) {
      it(`${testCase.name}: invalid ${field} throws CombustionInputError with field '${field}'`, () => {
        const others = Object.fromEntries(
          Object.entries(testCase.fields)
            .filter(([name]) => name !== field)
            .map(([name, spec]) => [name, spec.valid]),
        );
        fc.assert(
          fc.property(fc.record(others), testCase.fields[field].invalid, (validArgs, bad) => {
            expectInputError(() => testCase.call({ ...validArgs, [field]: bad }), field as CombustionInputField);
          }),
          RUNS,
        );
      });
    }
  }

  it('flueLossPct: any flue temperature below the air temperature throws with field flueTempC', () => {
    const inverted = fc
      .tuple(within(RANGES.tempC), within(RANGES.tempC))
      .filter(([a, b]) => a !== b)
      .map(([a, b]) => ({ flueTempC: Math.min(a, b), airTempC: Math.max(a, b) }));
    fc.assert(
      fc.property(fuel(), inverted, within(RANGES.o2Pct), (fuelId, temps, o2Pct) => {
        expectInputError(() => flueLossPct({ fuel: fuelId, o2Pct, ...temps }), 'flueTempC');
      }),
      RUNS,
    );
  });

  it('co2MaxFromComposition: fractions summing to more than 0.005 away from 1 throw with field moleFractions', () => {
    const offSum = fc
      .tuple(
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
      )
      .filter(([ch4, c3h8, n2]) => Math.abs(ch4 + c3h8 + n2 - 1) > 0.0051);
    fc.assert(
      fc.property(offSum, ([CH4, C3H8, N2]) => {
        expectInputError(() => co2MaxFromComposition({ CH4, C3H8, N2 }), 'moleFractions');
      }),
      RUNS,
    );
  });

  it('co2MaxFromComposition: any non-finite or out-of-range fraction throws with field moleFractions', () => {
    const species = fc.constantFrom('CH4', 'C2H6', 'C3H8', 'C4H10', 'N2', 'CO2');
    fc.assert(
      fc.property(species, invalidFor({ min: 0, max: 1 }, { includeMissing: false }), (name, bad) => {
        expectInputError(() => loose(co2MaxFromComposition)({ CH4: 1, [name]: bad }), 'moleFractions');
      }),
      RUNS,
    );
  });
});
