// Carboxyhaemoglobin (COHb) by the Coburn–Forster–Kane equation, linear form (the O2Hb
// concentration held constant), which has a closed-form solution. Parameters and their sources are
// in /work/shared/reference/combustion-figures.md ("Ambient CO exposure"). Pure: no framework, I/O
// or clock, so the field app runs it offline exactly as the server does.

export type CfkParameters = {
  /** Haldane constant M: CO's affinity for haemoglobin relative to O2. */
  haldaneM: number;
  /** Endogenous CO production, mL/min. */
  endogenousCoMlPerMin: number;
  /** Barometric pressure less water vapour pressure at body temperature, mmHg. */
  dryAlveolarPressureMmHg: number;
  /** Mean pulmonary capillary O2 partial pressure, mmHg. */
  capillaryO2MmHg: number;
  /** Lung diffusing capacity for CO, mL/min/mmHg. */
  diffusingCapacityMlPerMinMmHg: number;
  /** Alveolar ventilation, mL/min. */
  alveolarVentilationMlPerMin: number;
  /** Blood volume, mL. */
  bloodVolumeMl: number;
  /** O2 capacity of fully saturated blood, mL O2 per mL blood (≈1.39 × Hb g/mL; 0.20 for Hb ≈14.5 g/dL). */
  o2CapacityMlPerMl: number;
};

export type ActivityPreset = 'resting' | 'light_work';

export const ACTIVITY_LABELS: Record<ActivityPreset, string> = {
  resting: 'Resting adult',
  light_work: 'Adult doing light work',
};

/**
 * Resting values are the reference sheet's. Light work raises ventilation and diffusing capacity;
 * those two figures are from memory of the US EPA CO criteria document's light-exercise cases and
 * are labelled so wherever shown.
 */
export const CFK_PRESETS: Record<ActivityPreset, { parameters: CfkParameters; source: string }> = {
  resting: {
    parameters: {
      haldaneM: 218,
      endogenousCoMlPerMin: 0.007,
      dryAlveolarPressureMmHg: 713,
      capillaryO2MmHg: 100,
      diffusingCapacityMlPerMinMmHg: 30,
      alveolarVentilationMlPerMin: 6000,
      bloodVolumeMl: 5500,
      o2CapacityMlPerMl: 0.2,
    },
    source: 'Coburn–Forster–Kane parameters for a resting adult, reference sheet "Ambient CO exposure"; O2 capacity 0.20 mL/mL (Hb ≈14.5 g/dL, textbook value)',
  },
  light_work: {
    parameters: {
      haldaneM: 218,
      endogenousCoMlPerMin: 0.007,
      dryAlveolarPressureMmHg: 713,
      capillaryO2MmHg: 100,
      diffusingCapacityMlPerMinMmHg: 40,
      alveolarVentilationMlPerMin: 15000,
      bloodVolumeMl: 5500,
      o2CapacityMlPerMl: 0.2,
    },
    source: 'As resting, with alveolar ventilation 15 L/min and diffusing capacity 40 mL/min/mmHg for light work (from memory)',
  },
};

/** Typical COHb of a non-smoker breathing clean air, % (clinical references). */
export const BASELINE_COHB_PCT = 0.5;

export type CfkConstants = {
  /** 1/DL + PL/VA, min·mmHg/mL. */
  bTerm: number;
  /** Pc,O2 / (M · [O2Hb]), mmHg per (mL CO/mL blood). */
  aTerm: number;
  /** Vb · B / A: the exponential time constant, minutes. */
  timeConstantMin: number;
};

function check(name: string, value: number, min: number, max: number): number {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(`${name} must be a number from ${min} to ${max}, got ${String(value)}`);
  }
  return value;
}

export function cfkConstants(p: CfkParameters): CfkConstants {
  const bTerm = 1 / p.diffusingCapacityMlPerMinMmHg + p.dryAlveolarPressureMmHg / p.alveolarVentilationMlPerMin;
  const aTerm = p.capillaryO2MmHg / (p.haldaneM * p.o2CapacityMlPerMl);
  return { bTerm, aTerm, timeConstantMin: (p.bloodVolumeMl * bTerm) / aTerm };
}

/** Inspired CO partial pressure, mmHg, of a dry-gas concentration in ppm. */
function inspiredCoMmHg(coPpm: number, p: CfkParameters): number {
  return coPpm * 1e-6 * p.dryAlveolarPressureMmHg;
}

/** COHb, %, that a constant CO level would eventually bring the blood to. */
export function steadyStateCohbPct(input: { coPpm: number; parameters: CfkParameters }): number {
  const coPpm = check('coPpm', input.coPpm, 0, 100_000);
  const p = input.parameters;
  const { aTerm, bTerm } = cfkConstants(p);
  const cohbMlPerMl = (p.endogenousCoMlPerMin * bTerm + inspiredCoMmHg(coPpm, p)) / aTerm;
  return (100 * cohbMlPerMl) / p.o2CapacityMlPerMl;
}

/**
 * COHb, %, after `minutes` at a constant `coPpm`, starting from `startCohbPct`. The linear CFK
 * equation dC/dt = VCO/Vb − A·C/(Vb·B) + PICO/(Vb·B) relaxes exponentially to its steady state.
 */
export function cohbAfter(input: { coPpm: number; minutes: number; startCohbPct?: number; parameters: CfkParameters }): number {
  const minutes = check('minutes', input.minutes, 0, 60 * 24 * 14);
  const start = check('startCohbPct', input.startCohbPct ?? BASELINE_COHB_PCT, 0, 100);
  const steady = steadyStateCohbPct(input);
  const { timeConstantMin } = cfkConstants(input.parameters);
  return steady - (steady - start) * Math.exp(-minutes / timeConstantMin);
}
