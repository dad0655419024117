import { CombustionInputError } from './errors';
import { co2MaxForFuel, requireFuel, type FuelId } from './fuels';
import {
  CO2_MAX_PCT_RANGE,
  CO2_PCT_RANGE,
  CO_PPM_RANGE,
  O2_PCT_RANGE,
  TEMP_C_RANGE,
  requireInRange,
  type RangeRule,
} from './guards';
import { airFreeFromCo2Of, airFreeFromO2Of, co2FromO2Of, excessAirOf, lambdaOf, ratioOf, siegertLossPct } from './flue-gas';

export type FlueGasWarningCode =
  | 'co2_o2_mismatch'
  | 'sample_diluted'
  | 'co2_above_max'
  | 'temperature_inverted'
  | 'possible_condensing';

export interface FlueGasWarning {
  code: FlueGasWarningCode;
  message: string;
}

export interface FlueGasInput {
  fuel: FuelId;
  coPpm: number;
  co2Pct?: number;
  o2Pct?: number;
  flueTempC?: number;
  airTempC?: number;
  /** Defaults to co2MaxForFuel(fuel). */
  co2MaxPct?: number;
}

/**
 * Everything computable from one flue-gas reading. A figure is null when an input it needs was
 * not given. Lambda, excess air and flue loss use the O2 (field) forms, so they need O2.
 */
export interface FlueGasAnalysis {
  fuel: FuelId;
  co2MaxPct: number;
  coPpm: number;
  ratio: number | null;
  coAirFreeFromO2Ppm: number | null;
  coAirFreeFromCo2Ppm: number | null;
  co2FromO2Pct: number | null;
  lambda: number | null;
  excessAirPct: number | null;
  flueLossPct: number | null;
  /** 100 − flue loss; null wherever flue loss is. */
  netEfficiencyPct: number | null;
  warnings: FlueGasWarning[];
}

// Beyond this the two sensors disagree by more than analyser tolerances explain.
const CO2_O2_MISMATCH_PCT_POINTS = 0.5;
// Above this the sample is mostly air and the air-free correction multiplies sensor noise.
const DILUTED_O2_PCT = 18;
// Rough water dew point of flue gas from these fuels at normal excess air (from memory, about
// 45–57 °C); at or below this a condensing appliance is recovering latent heat Siegert ignores.
const CONDENSING_FLUE_TEMP_C = 60;

type OptionalField = 'co2Pct' | 'o2Pct' | 'flueTempC' | 'airTempC' | 'co2MaxPct';

function optional(field: OptionalField, value: unknown, range: RangeRule): number | null {
  // null is accepted as "not measured" because JSON cannot carry undefined.
  if (value === undefined || value === null) return null;
  return requireInRange(field, value, range);
}

const ZEROS = '000';

/**
 * value.toFixed(decimals) for the one or two decimals the warnings print. toFixed works in exact
 * decimal arithmetic and is slow; below a million in the last place, the scaled value carries an
 * error under 1e-9, so where it is not within 1e-6 of a half, rounding it picks the same digits.
 * Ties, and anything larger, go to toFixed itself.
 */
function fmt(value: number, decimals: 1 | 2): string {
  const scaled = Math.abs(value) * (decimals === 1 ? 10 : 100);
  if (scaled < 1e6) {
    const whole = Math.floor(scaled);
    const fraction = scaled - whole;
    if (Math.abs(fraction - 0.5) > 1e-6) {
      let digits = String(fraction > 0.5 ? whole + 1 : whole);
      if (digits.length <= decimals) digits = ZEROS.slice(0, decimals + 1 - digits.length) + digits;
      const text = `${digits.slice(0, digits.length - decimals)}.${digits.slice(digits.length - decimals)}`;
      // toFixed keeps the sign of a negative value that rounds to zero ("-0.00"), but not of -0.
      return value < 0 ? `-${text}` : text;
    }
  }
  return value.toFixed(decimals);
}

/**
 * Analyses one flue-gas reading: CO/CO2 ratio, air-free CO by both routes, CO2 expected from O2,
 * lambda, excess air, Siegert flue loss and net efficiency, with warnings about readings that
 * look wrong. Throws CombustionInputError for any invalid given value.
 */
export function analyseFlueGas(input: FlueGasInput): FlueGasAnalysis {
  if (typeof input !== 'object' || input === null) {
    throw new CombustionInputError('input', 'flue gas input must be an object');
  }
  const fuel = requireFuel(input.fuel);
  const coPpm = requireInRange('coPpm', input.coPpm, CO_PPM_RANGE);
  const co2Pct = optional('co2Pct', input.co2Pct, CO2_PCT_RANGE);
  const o2Pct = optional('o2Pct', input.o2Pct, O2_PCT_RANGE);
  const flueTempC = optional('flueTempC', input.flueTempC, TEMP_C_RANGE);
  const airTempC = optional('airTempC', input.airTempC, TEMP_C_RANGE);
  const co2MaxPct = optional('co2MaxPct', input.co2MaxPct, CO2_MAX_PCT_RANGE) ?? co2MaxForFuel(fuel);

  const warnings: FlueGasWarning[] = [];
  const co2FromO2Pct = o2Pct === null ? null : co2FromO2Of(o2Pct, co2MaxPct);

  if (co2Pct !== null && co2FromO2Pct !== null && Math.abs(co2Pct - co2FromO2Pct) > CO2_O2_MISMATCH_PCT_POINTS) {
    warnings.push({
      code: 'co2_o2_mismatch',
      message:
        `Measured CO2 (${fmt(co2Pct, 2)} %) differs from the CO2 expected from the O2 reading ` +
        `(${fmt(co2FromO2Pct, 2)} %) by more than ${CO2_O2_MISMATCH_PCT_POINTS} percentage points. ` +
        'Check the probe and sample line for air leaks, check the fuel and CO2max are right, ' +
        'and check the analyser sensors are in calibration.',
    });
  }
  if (o2Pct !== null && o2Pct > DILUTED_O2_PCT) {
    warnings.push({
      code: 'sample_diluted',
      message:
        `O2 is ${fmt(o2Pct, 1)} %, above ${DILUTED_O2_PCT} %: the sample is mostly air, so air-free CO is unreliable. ` +
        'Check the probe sits in the flue gas stream and the sample line does not leak, then take the reading again.',
    });
  }
  if (co2Pct !== null && co2Pct > co2MaxPct) {
    warnings.push({
      code: 'co2_above_max',
      message:
        `Measured CO2 (${fmt(co2Pct, 2)} %) is above the CO2max used (${fmt(co2MaxPct, 2)} %), which combustion cannot produce. ` +
        'Check the fuel selected matches the appliance, and check the CO2 sensor calibration.',
    });
  }

  let flueLossPct: number | null = null;
  if (flueTempC !== null && airTempC !== null) {
    if (flueTempC < airTempC) {
      warnings.push({
        code: 'temperature_inverted',
        message:
          `Flue temperature (${fmt(flueTempC, 1)} °C) is below the air temperature (${fmt(airTempC, 1)} °C), so no flue loss is given. ` +
          'Check the two probes are not swapped and the flue probe is in the flue gas stream.',
      });
    } else if (o2Pct !== null) {
      flueLossPct = siegertLossPct(fuel, flueTempC, airTempC, o2Pct);
    }
  }
  if (flueLossPct !== null && flueTempC !== null && flueTempC <= CONDENSING_FLUE_TEMP_C) {
    warnings.push({
      code: 'possible_condensing',
      message:
        `Flue temperature (${fmt(flueTempC, 1)} °C) is low enough that the appliance may be condensing. ` +
        'The flue loss formula does not hold in condensing operation; check whether the appliance is a condensing type ' +
        "and use the maker's efficiency figures if so.",
    });
  }

  return {
    fuel,
    co2MaxPct,
    coPpm,
    // Every value was checked above, so the formulas run without checking again.
    ratio: co2Pct === null ? null : ratioOf(coPpm, co2Pct),
    coAirFreeFromO2Ppm: o2Pct === null ? null : airFreeFromO2Of(coPpm, o2Pct),
    coAirFreeFromCo2Ppm: co2Pct === null ? null : airFreeFromCo2Of(coPpm, co2Pct, co2MaxPct),
    co2FromO2Pct,
    lambda: o2Pct === null ? null : lambdaOf(o2Pct),
    excessAirPct: o2Pct === null ? null : excessAirOf(o2Pct),
    flueLossPct,
    netEfficiencyPct: flueLossPct === null ? null : 100 - flueLossPct,
    warnings,
  };
}
