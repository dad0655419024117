// Diagnostic hints: from a reading's pattern, what an engineer commonly checks next. These are
// trade practice, not rules from a standard, and never a verdict: each is worded as things to check.
import { co2FromO2, co2MaxForFuel, type FuelId } from '../combustion';
import type { ApplianceCategory } from '../limits';

export type HintCode = 'high_co_low_o2' | 'high_co_high_o2' | 'co2_o2_mismatch' | 'high_flue_temp' | 'ratio_rising';

export type Hint = {
  code: HintCode;
  title: string;
  /** What in the reading raised it. */
  because: string;
  checks: string[];
  basis: 'common practice';
};

export type HintReading = {
  fuel: FuelId;
  category: ApplianceCategory;
  coPpm: number;
  co2Pct: number | null;
  o2Pct: number | null;
  flueTempC: number | null;
  airTempC: number | null;
  ratio: number | null;
  coAirFreePpm: number | null;
};

/** Thresholds of common practice (no single published source); kept together so they are easy to review. */
export const HINT_THRESHOLDS = {
  /** Air-free CO at or above this counts as "high CO" for pattern hints, ppm. */
  highCoAirFreePpm: 100,
  /** A ratio at or above this counts as "high CO" too. */
  highCoRatio: 0.004,
  /** O2 below this suggests too little combustion air, %. */
  lowO2Pct: 4,
  /** O2 above this suggests too much air or a chilled flame, %. */
  highO2Pct: 9,
  /** Measured CO2 further than this from CO2 computed from O2 suggests a leak or a sensor, % points. */
  co2MismatchPctPoints: 0.5,
  /** Flue temperature above this on a non-condensing appliance, °C. */
  highFlueTempC: 250,
  /** Flue temperature above this on a condensing boiler: it is not condensing, °C. */
  highFlueTempCondensingC: 100,
} as const;

function highCo(r: HintReading): boolean {
  return (r.coAirFreePpm !== null && r.coAirFreePpm >= HINT_THRESHOLDS.highCoAirFreePpm) || (r.ratio !== null && r.ratio >= HINT_THRESHOLDS.highCoRatio);
}

function coText(r: HintReading): string {
  return r.coAirFreePpm !== null ? `air-free CO ${Math.round(r.coAirFreePpm)} ppm` : `CO/CO2 ratio ${r.ratio?.toFixed(4)}`;
}

/** Hints for one reading, plus the ratio-rising hint when the appliance's trend says so. */
export function diagnosticHints(input: { reading: HintReading; ratioRising?: boolean }): Hint[] {
  const r = input.reading;
  const hints: Hint[] = [];
  const base = { basis: 'common practice' as const };

  if (highCo(r) && r.o2Pct !== null && r.o2Pct < HINT_THRESHOLDS.lowO2Pct) {
    hints.push({
      ...base,
      code: 'high_co_low_o2',
      title: 'High CO with low O2',
      because: `${coText(r)} with O2 ${r.o2Pct} %`,
      checks: [
        'Combustion air supply: vents, air inlets and the room-sealed case seals',
        'Gas rate and burner pressure against the data plate (over-gassing)',
        'Injector size and type for the gas in use',
        'Flue and heat exchanger for blockage restricting the draught',
      ],
    });
  }
  if (highCo(r) && r.o2Pct !== null && r.o2Pct > HINT_THRESHOLDS.highO2Pct) {
    hints.push({
      ...base,
      code: 'high_co_high_o2',
      title: 'High CO with high O2',
      because: `${coText(r)} with O2 ${r.o2Pct} %`,
      checks: [
        'Flame picture: flames lifting, touching the heat exchanger or the burner parts (impingement)',
        'Excess air or draught chilling the flame; fan speed on fan-assisted models',
        'Burner alignment and damaged or missing baffles',
        'The sample point and probe depth (air drawn into the sample)',
      ],
    });
  }
  if (r.co2Pct !== null && r.o2Pct !== null && r.o2Pct < 20.9) {
    const expected = co2FromO2(r.o2Pct, co2MaxForFuel(r.fuel));
    const gap = Math.abs(r.co2Pct - expected);
    if (gap > HINT_THRESHOLDS.co2MismatchPctPoints) {
      hints.push({
        ...base,
        code: 'co2_o2_mismatch',
        title: 'CO2 and O2 disagree',
        because: `CO2 ${r.co2Pct} % measured, ${expected.toFixed(1)} % expected from O2 ${r.o2Pct} % (a gap of ${gap.toFixed(1)} points)`,
        checks: [
          'Sample line, water trap and probe joints for a leak drawing in air',
          'The analyser fuel setting matches the appliance fuel',
          'Sensor age and the calibration date; zero the analyser in fresh air and retest',
        ],
      });
    }
  }
  if (r.flueTempC !== null) {
    const condensing = r.category === 'condensing_boiler';
    const limit = condensing ? HINT_THRESHOLDS.highFlueTempCondensingC : HINT_THRESHOLDS.highFlueTempC;
    if (r.flueTempC > limit) {
      hints.push({
        ...base,
        code: 'high_flue_temp',
        title: condensing ? 'Flue temperature high for a condensing boiler' : 'Very high flue temperature',
        because: `flue ${Math.round(r.flueTempC)} °C (above ${limit} °C)`,
        checks: [
          'Gas rate against the data plate (over-firing)',
          'Heat exchanger for fouling or scale; water flow and pump',
          ...(condensing ? ['Return temperature and controls: is it able to condense?'] : ['Missing or damaged baffles or flue restrictors']),
        ],
      });
    }
  }
  if (input.ratioRising) {
    hints.push({
      ...base,
      code: 'ratio_rising',
      title: 'Ratio rising over time',
      because: 'the CO/CO2 ratio rose at each of the last three inspections',
      checks: [
        'Burner and heat exchanger cleanliness (a service may be due)',
        'Seals, gaskets and the combustion chamber for gradual deterioration',
        'Compare the flame picture and gas rate with the last service record',
      ],
    });
  }
  return hints;
}

export const HINTS_NOTE = 'Suggestions from common trade practice of what to check; they are not a verdict and do not replace the manufacturer’s instructions.';
