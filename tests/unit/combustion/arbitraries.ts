// fast-check generators for the combustion tests: valid inputs over each documented range, and
// invalid values for a range. The ranges are written out here from the spec, not imported from
// lib/combustion, so a change to the code's ranges shows up as a failing test.
import fc from 'fast-check';
import { FUEL_IDS, type FuelId } from '../../../lib/combustion';

export interface Range {
  min: number;
  max: number;
  minExcluded?: boolean;
  maxExcluded?: boolean;
}

export const RANGES = {
  coPpm: { min: 0, max: 1_000_000 },
  co2Pct: { min: 0.01, max: 30 },
  co2MaxPct: { min: 0, max: 30, minExcluded: true },
  o2Pct: { min: 0, max: 20.9, maxExcluded: true },
  tempC: { min: -60, max: 1500 },
  tempF: { min: -76, max: 2732 },
  volume: { min: 0, max: 1_000_000, minExcluded: true },
  seconds: { min: 0.1, max: 1_000_000 },
  calorificValue: { min: 0, max: 10_000_000, minExcluded: true },
  ppm: { min: 0, max: 1_000_000 },
  molarMassGPerMol: { min: 0, max: 1000, minExcluded: true },
  pressureKPa: { min: 10, max: 1000 },
} satisfies Record<string, Range>;

export const fuel = (): fc.Arbitrary<FuelId> => fc.constantFrom(...FUEL_IDS);

export function within(range: Range): fc.Arbitrary<number> {
  return fc.double({
    min: range.min,
    max: range.max,
    minExcluded: range.minExcluded ?? false,
    maxExcluded: range.maxExcluded ?? false,
    noNaN: true,
  });
}

/** Values that are not usable numbers at all: NaN, infinities and other types smuggled in via `as any`. */
export function notANumber(options: { includeMissing: boolean }): fc.Arbitrary<unknown> {
  const others: fc.Arbitrary<unknown>[] = [
    fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY),
    fc.string(),
    fc.double({ noNaN: true }).map((n) => String(n)),
    fc.boolean(),
    fc.constant({}),
    fc.constant([5]),
    fc.bigInt(),
  ];
  if (options.includeMissing) others.push(fc.constantFrom(undefined, null));
  return fc.oneof(...others);
}

/** Finite numbers just outside the range, and anything that is not a number. */
export function invalidFor(range: Range, options = { includeMissing: true }): fc.Arbitrary<unknown> {
  // The filters drop -0 next to a bound of 0: fast-check orders -0 below 0, but it is a valid 0.
  const below = fc
    .double({ max: range.min, noNaN: true, noDefaultInfinity: true })
    .filter((x) => (range.minExcluded ? x <= range.min : x < range.min));
  const above = fc
    .double({ min: range.max, noNaN: true, noDefaultInfinity: true })
    .filter((x) => (range.maxExcluded ? x >= range.max : x > range.max));
  return fc.oneof(below, above, notANumber(options));
}

/** Anything that is not one of the given strings. */
export function notOneOf(allowed: readonly string[], options = { includeMissing: true }): fc.Arbitrary<unknown> {
  const strings = fc
    .oneof(fc.string(), fc.constantFrom('toString', '__proto__', 'constructor', ...allowed.map((a) => a.toUpperCase())))
    .filter((s) => !allowed.includes(s));
  const others: fc.Arbitrary<unknown>[] = [strings, fc.double(), fc.boolean(), fc.constant({})];
  if (options.includeMissing) others.push(fc.constantFrom(undefined, null));
  return fc.oneof(...others);
}
