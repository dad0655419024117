// Fuel table: ids, labels, and CO2max figures checked against stoichiometry
// (reference sheet: dry stoichiometric CO2max, derived).
import { describe, expect, it } from 'vitest';
import { FUEL_IDS, FUEL_LABELS, co2MaxForFuel, co2MaxFromComposition, isFuelId } from '../../../lib/combustion';

describe('fuel ids and labels', () => {
  it('lists the five fuels, each with a label', () => {
    expect([...FUEL_IDS]).toEqual(['natural-gas', 'propane', 'butane', 'kerosene', 'gas-oil']);
    for (const fuel of FUEL_IDS) expect(FUEL_LABELS[fuel].length).toBeGreaterThan(0);
    expect(Object.keys(FUEL_LABELS).sort()).toEqual([...FUEL_IDS].sort());
  });

  it('cannot be changed at run time', () => {
    expect(Object.isFrozen(FUEL_IDS)).toBe(true);
    expect(Object.isFrozen(FUEL_LABELS)).toBe(true);
  });

  it('isFuelId accepts the ids and nothing else, not even names inherited from Object', () => {
    for (const fuel of FUEL_IDS) expect(isFuelId(fuel)).toBe(true);
    for (const other of ['Natural gas', 'lpg', 'oil', '', 'toString', '__proto__', 'constructor', 1, null, undefined, {}]) {
      expect(isFuelId(other)).toBe(false);
    }
  });
});

describe('CO2max (stoichiometry)', () => {
  it('methane 11.70 ± 0.05 %: 1 / (1 + 3.773 × 2)', () => {
    expect(Math.abs(co2MaxFromComposition({ CH4: 1 }) - 11.7)).toBeLessThanOrEqual(0.05);
    expect(co2MaxFromComposition({ CH4: 1 })).toBeCloseTo(11.7014, 4);
  });

  it('propane 13.72 ± 0.05 %: 3 / (3 + 3.773 × 5)', () => {
    expect(Math.abs(co2MaxFromComposition({ C3H8: 1 }) - 13.72)).toBeLessThanOrEqual(0.05);
    expect(co2MaxFromComposition({ C3H8: 1 })).toBeCloseTo(13.7206, 4);
  });

  it('butane 14.02 ± 0.05 %: 4 / (4 + 3.773 × 6.5)', () => {
    expect(Math.abs(co2MaxFromComposition({ C4H10: 1 }) - 14.02)).toBeLessThanOrEqual(0.05);
  });

  it('the fuel table agrees with stoichiometry within 0.05 % for the gases', () => {
    expect(Math.abs(co2MaxForFuel('natural-gas') - co2MaxFromComposition({ CH4: 1 }))).toBeLessThanOrEqual(0.05);
    expect(Math.abs(co2MaxForFuel('propane') - co2MaxFromComposition({ C3H8: 1 }))).toBeLessThanOrEqual(0.05);
    expect(Math.abs(co2MaxForFuel('butane') - co2MaxFromComposition({ C4H10: 1 }))).toBeLessThanOrEqual(0.05);
  });

  it('the fuel table gives the reference sheet figures: 11.7, 13.72, 14.02, 15.1, 15.4 %', () => {
    expect(co2MaxForFuel('natural-gas')).toBe(11.7);
    expect(co2MaxForFuel('propane')).toBe(13.72);
    expect(co2MaxForFuel('butane')).toBe(14.02);
    // Oils: analyser defaults (reference sheet, practice), not a single composition.
    expect(co2MaxForFuel('kerosene')).toBe(15.1);
    expect(co2MaxForFuel('gas-oil')).toBe(15.4);
  });

  it('CO2 in the fuel raises CO2max; N2 in the fuel lowers it', () => {
    const pure = co2MaxFromComposition({ CH4: 1 });
    expect(co2MaxFromComposition({ CH4: 0.98, CO2: 0.02 })).toBeGreaterThan(pure);
    expect(co2MaxFromComposition({ CH4: 0.98, N2: 0.02 })).toBeLessThan(pure);
  });
});
