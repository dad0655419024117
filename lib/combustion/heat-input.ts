import { CombustionInputError } from './errors';
import { grossToNetRatio, requireFuel, type FuelId } from './fuels';
import { describeValue, requireInRange } from './guards';

export type VolumeUnit = 'm3' | 'ft3';
export type CalorificValueUnit = 'MJ/m3' | 'Btu/ft3';

export interface HeatInputInput {
  fuel: FuelId;
  /** Volume passed through the meter during the timing, in volumeUnit. */
  volume: number;
  volumeUnit: VolumeUnit;
  seconds: number;
  /** Gross (higher) calorific value, in cvUnit. */
  calorificValue: number;
  cvUnit: CalorificValueUnit;
}

export interface HeatInputResult {
  /** Volume per hour in the unit of the meter reading. */
  gasRate: number;
  gasRateUnit: 'm3/h' | 'ft3/h';
  grossKw: number;
  netKw: number;
}

const FT3_PER_M3 = 35.3147;
const BTU_PER_MJ = 947.817;
const BTU_PER_H_PER_KW = 3412.14;
const MJ_PER_KWH = 3.6;

// Generous limits that still keep every product finite. Under a tenth of a second cannot be timed
// by hand. Calorific value reaches tens of thousands of MJ/m3 for oils measured by volume.
const VOLUME_RANGE = { min: 0, max: 1_000_000, minExcluded: true };
const SECONDS_RANGE = { min: 0.1, max: 1_000_000 };
const CALORIFIC_VALUE_RANGE = { min: 0, max: 10_000_000, minExcluded: true };

function requireVolumeUnit(value: unknown): VolumeUnit {
  if (value !== 'm3' && value !== 'ft3') {
    throw new CombustionInputError('volumeUnit', `volumeUnit must be 'm3' or 'ft3' (got ${describeValue(value)})`);
  }
  return value;
}

function requireCvUnit(value: unknown): CalorificValueUnit {
  if (value !== 'MJ/m3' && value !== 'Btu/ft3') {
    throw new CombustionInputError('cvUnit', `cvUnit must be 'MJ/m3' or 'Btu/ft3' (got ${describeValue(value)})`);
  }
  return value;
}

/**
 * Heat input from a meter test: gas rate = 3600 × volume / seconds, then gross kW from the gross
 * calorific value and net kW from the fuel's gross/net ratio. The calorific value may be in the
 * other unit system from the meter; it is converted to match.
 */
export function heatInputKw(input: HeatInputInput): HeatInputResult {
  if (typeof input !== 'object' || input === null) {
    throw new CombustionInputError('input', 'heat input must be an object');
  }
  const fuel = requireFuel(input.fuel);
  const volume = requireInRange('volume', input.volume, VOLUME_RANGE);
  const volumeUnit = requireVolumeUnit(input.volumeUnit);
  const seconds = requireInRange('seconds', input.seconds, SECONDS_RANGE);
  const calorificValue = requireInRange('calorificValue', input.calorificValue, CALORIFIC_VALUE_RANGE);
  const cvUnit = requireCvUnit(input.cvUnit);

  const gasRate = (3600 * volume) / seconds;
  let grossKw: number;
  if (volumeUnit === 'm3') {
    const cvMjPerM3 = cvUnit === 'MJ/m3' ? calorificValue : (calorificValue * FT3_PER_M3) / BTU_PER_MJ;
    grossKw = (gasRate * cvMjPerM3) / MJ_PER_KWH;
  } else {
    const cvBtuPerFt3 = cvUnit === 'Btu/ft3' ? calorificValue : (calorificValue * BTU_PER_MJ) / FT3_PER_M3;
    grossKw = (gasRate * cvBtuPerFt3) / BTU_PER_H_PER_KW;
  }

  return {
    gasRate,
    gasRateUnit: volumeUnit === 'm3' ? 'm3/h' : 'ft3/h',
    grossKw,
    netKw: grossKw / grossToNetRatio(fuel),
  };
}
