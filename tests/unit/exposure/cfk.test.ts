// lib/exposure: COHb by the linear Coburn–Forster–Kane equation, and the exposure estimate for a
// room check. Sources are named beside each figure; tolerances are stated with each check.
import { describe, expect, it } from 'vitest';
import {
  BASELINE_COHB_PCT,
  CFK_PRESETS,
  cfkConstants,
  cohbAfter,
  coMgPerM3ToPpm,
  estimateExposure,
  steadyStateCohbPct,
  symptomBandFor,
  type CfkParameters,
} from '@/lib/exposure';

const resting = CFK_PRESETS.resting.parameters;

/**
 * Independent of the closed form under test: integrates the CFK differential equation
 * dC/dt = VCO/Vb − A·C/(Vb·B) + PICO/(Vb·B) with classical Runge–Kutta steps of one minute.
 */
function integrateCfk(p: CfkParameters, coPpm: number, minutes: number, startPct: number): number {
  const B = 1 / p.diffusingCapacityMlPerMinMmHg + p.dryAlveolarPressureMmHg / p.alveolarVentilationMlPerMin;
  const A = p.capillaryO2MmHg / (p.haldaneM * p.o2CapacityMlPerMl);
  const pico = coPpm * 1e-6 * p.dryAlveolarPressureMmHg;
  const f = (c: number) => p.endogenousCoMlPerMin / p.bloodVolumeMl - (A * c) / (p.bloodVolumeMl * B) + pico / (p.bloodVolumeMl * B);
  let c = (startPct / 100) * p.o2CapacityMlPerMl;
  const h = 1;
  for (let t = 0; t < minutes; t += h) {
    const k1 = f(c);
    const k2 = f(c + (h / 2) * k1);
    const k3 = f(c + (h / 2) * k2);
    const k4 = f(c + h * k3);
    c += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
  }
  return (100 * c) / p.o2CapacityMlPerMl;
}

describe('CFK time course, resting adult from 0.5 % COHb', () => {
  // Reference sheet "Ambient CO exposure": these three figures are DERIVED there (arithmetic from
  // the same parameters, not a published table), stated as "about"; tolerances are ±0.2 / ±0.5 / ±0.2
  // percentage points accordingly.
  it('35 ppm: about 1.3 % after 1 h (derived, reference sheet; ±0.2 points)', () => {
    expect(Math.abs(cohbAfter({ coPpm: 35, minutes: 60, parameters: resting }) - 1.3)).toBeLessThanOrEqual(0.2);
  });

  it('35 ppm: about 4 % after 8 h (derived, reference sheet; ±0.5 points)', () => {
    expect(Math.abs(cohbAfter({ coPpm: 35, minutes: 480, parameters: resting }) - 4)).toBeLessThanOrEqual(0.5);
  });

  it('100 ppm: about 2.7 % after 1 h (derived, reference sheet; ±0.2 points)', () => {
    expect(Math.abs(cohbAfter({ coPpm: 100, minutes: 60, parameters: resting }) - 2.7)).toBeLessThanOrEqual(0.2);
  });

  it.each([
    [35, 60],
    [35, 480],
    [100, 60],
    [400, 90],
    [9, 1440],
  ])('%s ppm for %s min agrees with a numerical integration of the CFK equation (relative 1e-6)', (coPpm, minutes) => {
    const closed = cohbAfter({ coPpm, minutes, startCohbPct: BASELINE_COHB_PCT, parameters: resting });
    const numeric = integrateCfk(resting, coPpm, minutes, BASELINE_COHB_PCT);
    expect(Math.abs(closed - numeric) / numeric).toBeLessThan(1e-6);
  });

  it('short high exposure is within 35 % of the Stewart et al. (1973) empirical uptake equation', () => {
    // %COHb rise = 3.317e-5 · ppm^1.036 · RMV · t (Stewart, Peterson et al., Arch. Environ. Health 26, 1973,
    // as quoted by coheadquarters.com); RMV 8 L/min for a resting adult is from memory. Different models,
    // so only rough agreement is expected: tolerance ±35 % of the empirical rise.
    const rise = cohbAfter({ coPpm: 500, minutes: 30, parameters: resting }) - BASELINE_COHB_PCT;
    const empirical = 3.317e-5 * 500 ** 1.036 * 8 * 30;
    expect(Math.abs(rise - empirical) / empirical).toBeLessThan(0.35);
  });
});

describe('CFK steady state and time constant (closed form of the linear equation)', () => {
  // Worked from the formulas: B = 1/30 + 713/6000 = 0.152167; A = 100/(218 × 0.20) = 2.29358.
  const B = 1 / 30 + 713 / 6000;
  const A = 100 / (218 * 0.2);

  it('constants match the hand-worked values (relative 1e-9)', () => {
    const k = cfkConstants(resting);
    expect(k.bTerm).toBeCloseTo(B, 9);
    expect(k.aTerm).toBeCloseTo(A, 9);
    // τ = Vb·B/A = 5500 × 0.152167 / 2.29358 ≈ 364.9 min (about 6 h): worked from the formulas, ±0.5 min.
    expect(Math.abs(k.timeConstantMin - 364.9)).toBeLessThan(0.5);
  });

  it('steady state at 35 ppm is (VCO·B + PICO)/A ≈ 5.67 % (worked from the formulas, ±0.01 points)', () => {
    const expected = (100 * ((0.007 * B + 35e-6 * 713) / A)) / 0.2;
    expect(Math.abs(expected - 5.67)).toBeLessThan(0.01);
    expect(steadyStateCohbPct({ coPpm: 35, parameters: resting })).toBeCloseTo(expected, 9);
  });

  it('after one time constant the blood has gone 1 − 1/e of the way to steady state', () => {
    const tau = cfkConstants(resting).timeConstantMin;
    const steady = steadyStateCohbPct({ coPpm: 100, parameters: resting });
    const at = cohbAfter({ coPpm: 100, minutes: tau, parameters: resting });
    expect((at - BASELINE_COHB_PCT) / (steady - BASELINE_COHB_PCT)).toBeCloseTo(1 - Math.exp(-1), 9);
  });

  it('approaches the steady state and never passes it; starts where it is told', () => {
    const steady = steadyStateCohbPct({ coPpm: 50, parameters: resting });
    expect(cohbAfter({ coPpm: 50, minutes: 0, parameters: resting })).toBeCloseTo(BASELINE_COHB_PCT, 12);
    const week = cohbAfter({ coPpm: 50, minutes: 60 * 24 * 7, parameters: resting });
    expect(week).toBeLessThanOrEqual(steady);
    expect(steady - week).toBeLessThan(1e-6);
  });

  it('clean air lets a raised COHb fall back towards the endogenous level', () => {
    const after = cohbAfter({ coPpm: 0, minutes: 240, startCohbPct: 10, parameters: resting });
    expect(after).toBeLessThan(10);
    expect(after).toBeGreaterThan(steadyStateCohbPct({ coPpm: 0, parameters: resting }));
  });

  it('light work takes up CO faster than rest at the same level', () => {
    const rest = cohbAfter({ coPpm: 50, minutes: 60, parameters: resting });
    const work = cohbAfter({ coPpm: 50, minutes: 60, parameters: CFK_PRESETS.light_work.parameters });
    expect(work).toBeGreaterThan(rest);
  });

  it('refuses nonsense input rather than guessing', () => {
    expect(() => cohbAfter({ coPpm: -1, minutes: 60, parameters: resting })).toThrow(RangeError);
    expect(() => cohbAfter({ coPpm: 10, minutes: Number.NaN, parameters: resting })).toThrow(RangeError);
  });
});

describe('estimateExposure', () => {
  const jurisdiction = { jurisdictionName: 'Albion (national)', serviceAtPpm: 10, dangerAtPpm: 30, comparator: 'gte' as const, source: 'BS 7967 clause 6.2.2 (from memory)' };

  it('WHO figures converted at 25 °C: 35 mg/m3 ≈ 30.6 ppm, 10 mg/m3 ≈ 8.7 ppm (ideal gas law, ±0.1 ppm)', () => {
    expect(Math.abs(coMgPerM3ToPpm(35) - 30.57)).toBeLessThan(0.1);
    expect(Math.abs(coMgPerM3ToPpm(10) - 8.73)).toBeLessThan(0.1);
  });

  it('a 40 ppm room check for 20 minutes: estimates at the measured time, 1 h and 8 h; over the 1-h WHO figure; danger by the jurisdiction rule', () => {
    const e = estimateExposure({ coPpm: 40, minutes: 20, jurisdiction });
    const restingEstimate = e.estimates.find((x) => x.activity === 'resting')!;
    expect(restingEstimate.atMeasured?.minutes).toBe(20);
    expect(restingEstimate.atMeasured!.cohbPct).toBeLessThan(restingEstimate.after1h.cohbPct);
    expect(restingEstimate.after1h.cohbPct).toBeLessThan(restingEstimate.after8h.cohbPct);
    expect(e.limits.find((l) => l.body === 'WHO indoor air' && l.averagingMin === 60)?.exceeded).toBe(true);
    expect(e.limits.find((l) => l.body === 'WHO indoor air' && l.averagingMin === 15)?.exceeded).toBe(false);
    expect(e.jurisdiction?.level).toBe('danger');
    expect(e.high).toBe(true);
    expect(e.disclaimer).toMatch(/not a diagnosis/);
  });

  it('a 3 ppm reading is clear everywhere and not "high"; no duration means no measured-time estimate', () => {
    const e = estimateExposure({ coPpm: 3, minutes: null, jurisdiction });
    expect(e.jurisdiction?.level).toBe('clear');
    expect(e.high).toBe(false);
    expect(e.estimates[0]!.atMeasured).toBeNull();
    expect(e.limits.every((l) => !l.exceeded)).toBe(true);
  });

  it('symptom bands follow the clinical references on the reference sheet', () => {
    expect(symptomBandFor(1).label).toMatch(/WHO/);
    expect(symptomBandFor(16).label).toBe('Headache');
    expect(symptomBandFor(25).label).toMatch(/Nausea/);
    expect(symptomBandFor(45).label).toBe('Collapse');
    expect(symptomBandFor(70).label).toBe('Often fatal');
  });
});
