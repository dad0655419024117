import { CombustionInputError } from './errors';
import { requireFuel, siegertConstants, type FuelId } from './fuels';
import {
  CO2_MAX_PCT_RANGE,
  CO2_PCT_RANGE,
  CO_PPM_RANGE,
  O2_PCT_RANGE,
  TEMP_C_RANGE,
  requireInRange,
} from './guards';

/** O2 in dry air (%), the reference for the O2 route to air-free CO and for lambda. */
const O2_IN_AIR_PCT = 20.9;
/** The Siegert formula is published with 21, not 20.9; kept as published. */
const SIEGERT_O2_REFERENCE_PCT = 21;

// The formulas on values already checked, so analyseFlueGas, which checks its whole input once,
// does not check each value again per figure. The exported functions below check, then call these.

export function ratioOf(co: number, co2: number): number {
  return co / 10_000 / co2;
}

export function airFreeFromO2Of(co: number, o2: number): number {
  // Factor first, so an undiluted sample (O2 = 0) returns CO exactly.
  return co * (O2_IN_AIR_PCT / (O2_IN_AIR_PCT - o2));
}

export function airFreeFromCo2Of(co: number, co2: number, co2Max: number): number {
  return co * (co2Max / co2);
}

export function co2FromO2Of(o2: number, co2Max: number): number {
  // Fraction first, so the result never rounds above CO2max (at O2 = 0 it is exactly CO2max).
  return co2Max * ((O2_IN_AIR_PCT - o2) / O2_IN_AIR_PCT);
}

export function lambdaOf(o2: number): number {
  return O2_IN_AIR_PCT / (O2_IN_AIR_PCT - o2);
}

export function excessAirOf(o2: number): number {
  return (100 * o2) / (O2_IN_AIR_PCT - o2);
}

/** CO/CO2 ratio (dimensionless, e.g. 0.004 — not a percentage): (CO ppm / 10 000) / CO2 %. BS 7967 method. */
export function coCo2Ratio(coPpm: number, co2Pct: number): number {
  const co = requireInRange('coPpm', coPpm, CO_PPM_RANGE);
  const co2 = requireInRange('co2Pct', co2Pct, CO2_PCT_RANGE);
  return ratioOf(co, co2);
}

/** Air-free CO (ppm) by the O2 route, referred to 20.9 % O2: CO × 20.9 / (20.9 − O2). */
export function airFreeCoFromO2(coPpm: number, o2Pct: number): number {
  const co = requireInRange('coPpm', coPpm, CO_PPM_RANGE);
  const o2 = requireInRange('o2Pct', o2Pct, O2_PCT_RANGE);
  return airFreeFromO2Of(co, o2);
}

/**
 * Air-free CO (ppm) by the CO2 ("ultimate CO2") route: CO × CO2max / CO2.
 * A CO2 above CO2max is accepted here (it gives a figure below CO); analyseFlueGas warns about it.
 */
export function airFreeCoFromCo2(coPpm: number, co2Pct: number, co2MaxPct: number): number {
  const co = requireInRange('coPpm', coPpm, CO_PPM_RANGE);
  const co2 = requireInRange('co2Pct', co2Pct, CO2_PCT_RANGE);
  const co2Max = requireInRange('co2MaxPct', co2MaxPct, CO2_MAX_PCT_RANGE);
  return airFreeFromCo2Of(co, co2, co2Max);
}

/** CO2 (%) expected from measured O2: CO2max × (20.9 − O2) / 20.9. */
export function co2FromO2(o2Pct: number, co2MaxPct: number): number {
  const o2 = requireInRange('o2Pct', o2Pct, O2_PCT_RANGE);
  const co2Max = requireInRange('co2MaxPct', co2MaxPct, CO2_MAX_PCT_RANGE);
  return co2FromO2Of(o2, co2Max);
}

/** Air ratio lambda, field form from O2: 20.9 / (20.9 − O2). Ignores fuel-specific flue-gas volume. */
export function lambdaFromO2(o2Pct: number): number {
  return lambdaOf(requireInRange('o2Pct', o2Pct, O2_PCT_RANGE));
}

/** Excess air (%), field form from O2: 100 × O2 / (20.9 − O2). */
export function excessAirPct(o2Pct: number): number {
  return excessAirOf(requireInRange('o2Pct', o2Pct, O2_PCT_RANGE));
}

export interface FlueLossInput {
  fuel: FuelId;
  flueTempC: number;
  airTempC: number;
  o2Pct: number;
}

/**
 * Flue loss qA (%) by the Siegert formula with the 1. BImSchV constants:
 * (flue − air) × (A2 / (21 − O2) + B). Butane uses the LPG constants; kerosene and gas oil
 * use the heating-oil constants.
 *
 * Does not hold in condensing operation (flue gas below its water dew point): the latent heat
 * recovered there is outside the formula, so the loss is overstated and efficiency understated.
 *
 * Throws if flueTempC is below airTempC, since a negative loss has no meaning;
 * analyseFlueGas reports that case as a warning instead.
 */
export function flueLossPct(input: FlueLossInput): number {
  if (typeof input !== 'object' || input === null) {
    throw new CombustionInputError('input', 'flue loss input must be an object');
  }
  const fuel = requireFuel(input.fuel);
  const flueTempC = requireInRange('flueTempC', input.flueTempC, TEMP_C_RANGE);
  const airTempC = requireInRange('airTempC', input.airTempC, TEMP_C_RANGE);
  const o2 = requireInRange('o2Pct', input.o2Pct, O2_PCT_RANGE);
  if (flueTempC < airTempC) {
    throw new CombustionInputError(
      'flueTempC',
      `flueTempC must be a number from airTempC (${airTempC}) to ${TEMP_C_RANGE.max} (got ${flueTempC})`,
    );
  }
  return siegertLossPct(fuel, flueTempC, airTempC, o2);
}

/** The bare formula, for callers that have already validated and ordered the temperatures. */
export function siegertLossPct(fuel: FuelId, flueTempC: number, airTempC: number, o2Pct: number): number {
  const { a2, b } = siegertConstants(fuel);
  return (flueTempC - airTempC) * (a2 / (SIEGERT_O2_REFERENCE_PCT - o2Pct) + b);
}
