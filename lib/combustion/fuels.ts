import { CombustionInputError } from './errors';
import { describeValue } from './guards';

export type FuelId = 'natural-gas' | 'propane' | 'butane' | 'kerosene' | 'gas-oil';

export const FUEL_IDS: readonly FuelId[] = Object.freeze([
  'natural-gas',
  'propane',
  'butane',
  'kerosene',
  'gas-oil',
] as const);

export const FUEL_LABELS: Readonly<Record<FuelId, string>> = Object.freeze({
  'natural-gas': 'Natural gas',
  propane: 'Propane',
  butane: 'Butane',
  kerosene: 'Kerosene',
  'gas-oil': 'Gas oil',
});

export function isFuelId(x: unknown): x is FuelId {
  // includes() rather than `in`, so 'toString' and friends are not fuels.
  return typeof x === 'string' && (FUEL_IDS as readonly string[]).includes(x);
}

export function requireFuel(value: unknown): FuelId {
  if (!isFuelId(value)) {
    throw new CombustionInputError(
      'fuel',
      `fuel must be one of ${FUEL_IDS.join(', ')} (got ${describeValue(value)})`,
    );
  }
  return value;
}

// Dry stoichiometric CO2max in %. Natural gas uses the methane figure (11.70) as analysers do;
// propane and butane are the stoichiometric figures; the oils are the usual analyser defaults
// because their composition varies.
const CO2_MAX_PCT: Readonly<Record<FuelId, number>> = {
  'natural-gas': 11.7,
  propane: 13.72,
  butane: 14.02,
  kerosene: 15.1,
  'gas-oil': 15.4,
};

/** Dry stoichiometric CO2max (%) for the fuel. */
export function co2MaxForFuel(fuel: FuelId): number {
  return CO2_MAX_PCT[requireFuel(fuel)];
}

// Gross/net calorific value ratios from fuel property tables (approximate). The oil figures are
// the roughest: published tables put kerosene and gas oil between about 1.06 and 1.07.
const GROSS_TO_NET_RATIO: Readonly<Record<FuelId, number>> = {
  'natural-gas': 1.11,
  propane: 1.09,
  butane: 1.08,
  kerosene: 1.06,
  'gas-oil': 1.06,
};

export function grossToNetRatio(fuel: FuelId): number {
  return GROSS_TO_NET_RATIO[requireFuel(fuel)];
}

export interface SiegertConstants {
  a1: number;
  a2: number;
  b: number;
}

// 1. BImSchV (Germany). Butane burns as LPG; kerosene and gas oil as heating oil.
const SIEGERT_HEATING_OIL: SiegertConstants = { a1: 0.5, a2: 0.68, b: 0.007 };
const SIEGERT_LPG: SiegertConstants = { a1: 0.42, a2: 0.63, b: 0.008 };
const SIEGERT_NATURAL_GAS: SiegertConstants = { a1: 0.37, a2: 0.66, b: 0.009 };

const SIEGERT_BY_FUEL: Readonly<Record<FuelId, SiegertConstants>> = {
  'natural-gas': SIEGERT_NATURAL_GAS,
  propane: SIEGERT_LPG,
  butane: SIEGERT_LPG,
  kerosene: SIEGERT_HEATING_OIL,
  'gas-oil': SIEGERT_HEATING_OIL,
};

export function siegertConstants(fuel: FuelId): SiegertConstants {
  return SIEGERT_BY_FUEL[requireFuel(fuel)];
}

export type GasSpecies = 'CH4' | 'C2H6' | 'C3H8' | 'C4H10' | 'N2' | 'CO2';
export type MoleFractions = Partial<Record<GasSpecies, number>>;

// Per mole of fuel gas: moles of CO2 formed (n of CnHm) and O2 needed (n + m/4).
const SPECIES: Readonly<Record<GasSpecies, { co2Formed: number; o2Needed: number }>> = {
  CH4: { co2Formed: 1, o2Needed: 2 },
  C2H6: { co2Formed: 2, o2Needed: 3.5 },
  C3H8: { co2Formed: 3, o2Needed: 5 },
  C4H10: { co2Formed: 4, o2Needed: 6.5 },
  N2: { co2Formed: 0, o2Needed: 0 },
  // CO2 in the fuel passes through and counts with the CO2 formed.
  CO2: { co2Formed: 1, o2Needed: 0 },
};
const SPECIES_NAMES = Object.keys(SPECIES) as GasSpecies[];

// Moles of N2 that come with each mole of O2 in dry air (79.05 / 20.95).
const N2_PER_O2_IN_AIR = 3.773;
const FRACTION_SUM_TOLERANCE = 0.005;

/**
 * Dry stoichiometric CO2max (%) of a fuel gas from its mole fractions:
 * CO2 / (CO2 + N2 in fuel + 3.773 × O2 needed). The result does not depend on scale, so
 * fractions that sum to 1 within 0.005 are used as given, without renormalising.
 */
export function co2MaxFromComposition(moleFractions: MoleFractions): number {
  if (typeof moleFractions !== 'object' || moleFractions === null || Array.isArray(moleFractions)) {
    throw new CombustionInputError(
      'moleFractions',
      `moleFractions must be an object of mole fractions from 0 to 1 (got ${describeValue(moleFractions)})`,
    );
  }
  const unknown = Object.keys(moleFractions).filter((key) => !(SPECIES_NAMES as string[]).includes(key));
  if (unknown.length > 0) {
    throw new CombustionInputError(
      'moleFractions',
      `moleFractions may only name ${SPECIES_NAMES.join(', ')} (got ${unknown.map((k) => JSON.stringify(k)).join(', ')})`,
    );
  }

  let sum = 0;
  let co2Formed = 0;
  let o2Needed = 0;
  let n2InFuel = 0;
  for (const species of SPECIES_NAMES) {
    const raw: unknown = moleFractions[species];
    if (raw === undefined) continue;
    if (typeof raw !== 'number' || !Number.isFinite(raw) || raw < 0 || raw > 1) {
      throw new CombustionInputError(
        'moleFractions',
        `moleFractions.${species} must be a number from 0 to 1 (got ${describeValue(raw)})`,
      );
    }
    sum += raw;
    co2Formed += raw * SPECIES[species].co2Formed;
    o2Needed += raw * SPECIES[species].o2Needed;
    if (species === 'N2') n2InFuel += raw;
  }

  if (Math.abs(sum - 1) > FRACTION_SUM_TOLERANCE) {
    throw new CombustionInputError(
      'moleFractions',
      `moleFractions must sum to 1 within ${FRACTION_SUM_TOLERANCE} (got ${sum})`,
    );
  }
  // Without a hydrocarbon there is nothing to burn, and an all-N2 gas would give 0 / 0.
  if (o2Needed <= 0) {
    throw new CombustionInputError(
      'moleFractions',
      'moleFractions must include at least one hydrocarbon (CH4, C2H6, C3H8 or C4H10) above 0',
    );
  }

  return (100 * co2Formed) / (co2Formed + n2InFuel + N2_PER_O2_IN_AIR * o2Needed);
}
