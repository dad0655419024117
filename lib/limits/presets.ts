// Starting-point limit presets an office can copy into a jurisdiction's code profile.
// Built only from the shared reference sheet (reference/combustion-figures.md); edit when that sheet changes.
import type { ApplianceCategory, FuelId, LimitRule, Metric, RuleScope } from './types';

export type PresetRule = Omit<LimitRule, 'id'>;

export interface LimitPreset {
  id: string;
  name: string;
  description: string;
  caution: string;
  rules: PresetRule[];
}

/** Carried by every rule whose figure the reference sheet marks as from memory or in conflict. */
export const MEMORY_NOTE = 'Figure from memory — verify against the adopted edition and local code.';

const COMMON_CAUTION =
  'Reference values to start from, not a copy of any standard; some figures are from memory. ' +
  'Check every figure against the edition adopted locally, the local code and the manufacturer\'s instructions ' +
  'before relying on a verdict. The figures support, and do not replace, the engineer\'s judgement.';

// ANSI Z21 and BS 7967 are gas-appliance standards (natural gas and LPG), so their rules are scoped to these fuels.
const GAS_FUELS: readonly FuelId[] = ['natural-gas', 'propane', 'butane'];

// Appliances with a flue whose products an analyser samples. 'other' is included so an
// unlisted appliance is still held to the general figure rather than left without one.
const FLUED_CATEGORIES: readonly ApplianceCategory[] = ['boiler', 'condensing_boiler', 'furnace', 'water_heater', 'space_heater', 'other'];

function scope(category: ApplianceCategory | null, fuel: FuelId | null = null): RuleScope {
  return { category, fuel, testPoint: null };
}

function perGasFuel(category: ApplianceCategory, rule: Omit<PresetRule, 'scope'>): PresetRule[] {
  return GAS_FUELS.map((fuel) => ({ ...rule, scope: scope(category, fuel) }));
}

// A failed spillage test (value 1) is a make-safe-now finding everywhere in common practice.
const SPILLAGE_RULE: PresetRule = {
  metric: 'spillage',
  scope: scope(null),
  comparator: 'gte',
  serviceAt: null,
  dangerAt: 1,
  source: 'Common trade practice: a failed spillage test means make safe (reference sheet, practice)',
  note: null,
};

/*
 * North America. Two sources, combined per category:
 * - ANSI Z21 certification maximums for air-free CO (400 furnaces/boilers/vented heaters,
 *   800 ranges and ovens, 200 unvented heaters) are the danger level: an appliance beyond
 *   the figure it was certified to is not fit to run.
 * - The older BPI field action table (from memory) gives the service level for flued
 *   appliances: air-free above 50 / as-measured above 25 is "repair advised". Its
 *   "shut off" band (air-free above 800 / as-measured above 400) is the danger level where
 *   no ANSI figure applies (oil appliances, as-measured CO). Its middle band ("stop work
 *   until repaired", 201–800 / 101–400) means stop the contractor's work, so it stays service.
 * The BPI table is for flue CO; ranges, ovens and unvented heaters have no flue, so they get
 * the ANSI maximum alone and no BPI service level.
 */
const BPI_SOURCE = 'BPI technical standards, flue CO action levels (older tables), via reference sheet (from memory)';

function ansiAirFree(category: ApplianceCategory, standard: string, dangerAt: number, note: string | null): PresetRule[] {
  const flued = FLUED_CATEGORIES.includes(category);
  return perGasFuel(category, {
    metric: 'co_air_free_ppm',
    comparator: 'gt',
    serviceAt: flued ? 50 : null,
    dangerAt,
    source: flued
      ? `${standard} ${dangerAt} ppm air-free maximum, via reference sheet; service level 50 ppm from the BPI field action table (from memory)`
      : `${standard} ${dangerAt} ppm air-free maximum, via reference sheet`,
    note,
  });
}

const NA_RULES: PresetRule[] = [
  // General flued-appliance figures (any fuel); the per-category gas rules below are more specific and win.
  ...FLUED_CATEGORIES.flatMap((category): PresetRule[] => [
    {
      metric: 'co_air_free_ppm',
      scope: scope(category),
      comparator: 'gt',
      serviceAt: 50,
      dangerAt: 800,
      source: BPI_SOURCE,
      note: MEMORY_NOTE,
    },
    {
      metric: 'co_as_measured_ppm',
      scope: scope(category),
      comparator: 'gt',
      serviceAt: 25,
      dangerAt: 400,
      source: BPI_SOURCE,
      note: MEMORY_NOTE,
    },
  ]),
  // The service level in these comes from the BPI table (from memory), hence the note.
  ...ansiAirFree('furnace', 'ANSI Z21.47 (furnaces)', 400, MEMORY_NOTE),
  ...ansiAirFree('boiler', 'ANSI Z21.13 (boilers)', 400, MEMORY_NOTE),
  ...ansiAirFree('condensing_boiler', 'ANSI Z21.13 (boilers)', 400, MEMORY_NOTE),
  ...ansiAirFree('space_heater', 'ANSI Z21.86 (vented heaters)', 400, MEMORY_NOTE),
  ...ansiAirFree(
    'water_heater',
    'ANSI Z21.10.1 (water heaters)',
    400,
    `${MEMORY_NOTE} The reference sheet records a conflict: one trade source gives 200 ppm.`,
  ),
  ...ansiAirFree('cooker', 'ANSI Z21.1 (ranges and ovens)', 800, null),
  ...ansiAirFree('unvented_heater', 'ANSI Z21.11.2 (unvented room heaters)', 200, null),
  {
    // Ambient CO at which testing stops: a hazard to the people in the room, so danger.
    metric: 'room_co_ppm',
    scope: scope(null),
    comparator: 'gt',
    serviceAt: null,
    dangerAt: 35,
    source: 'NREL Standard Work Specifications 2.0105.1 (stop testing above 35 ppm ambient), via reference sheet',
    note: null,
  },
  SPILLAGE_RULE,
];

/*
 * United Kingdom. BS 7967 judges flue gas by the CO/CO2 ratio; going over the figure means
 * service (and, if servicing cannot bring it back, the engineer's at-risk procedure), so these
 * are service levels. Room CO has both: 10 ppm or more find the source, 30 or more make safe.
 */
const BS7967_CLAUSE_12 = 'BS 7967 clause 12 (from memory), via reference sheet';
const CONDENSING_SOURCE = 'Heating industry trade body guidance for condensing boilers where the manufacturer is silent, via reference sheet';
const CONDENSING_NOTE =
  'Applies where the manufacturer gives no figure. Enter the manufacturer\'s figure on the appliance: it is applied where it is stricter; a looser one needs a local rule.';

const UK_RULES: PresetRule[] = [
  ...perGasFuel('boiler', { metric: 'co_co2_ratio', comparator: 'gt', serviceAt: 0.008, dangerAt: null, source: BS7967_CLAUSE_12, note: MEMORY_NOTE }),
  // Warm-air heaters are this product's 'furnace' category.
  ...perGasFuel('furnace', { metric: 'co_co2_ratio', comparator: 'gt', serviceAt: 0.008, dangerAt: null, source: BS7967_CLAUSE_12, note: MEMORY_NOTE }),
  ...perGasFuel('space_heater', {
    metric: 'co_co2_ratio',
    comparator: 'gt',
    serviceAt: 0.02,
    dangerAt: null,
    source: `${BS7967_CLAUSE_12}, open-flued gas fires`,
    note: `${MEMORY_NOTE} The figure is for open-flued gas fires; check it fits other space heaters.`,
  }),
  ...perGasFuel('condensing_boiler', { metric: 'co_co2_ratio', comparator: 'gt', serviceAt: 0.004, dangerAt: null, source: CONDENSING_SOURCE, note: CONDENSING_NOTE }),
  // "CO ≤ 350 ppm" is read straight from the analyser, so it is the as-measured metric.
  ...perGasFuel('condensing_boiler', { metric: 'co_as_measured_ppm', comparator: 'gt', serviceAt: 350, dangerAt: null, source: CONDENSING_SOURCE, note: CONDENSING_NOTE }),
  {
    metric: 'room_co_ppm',
    scope: scope(null),
    comparator: 'gte',
    serviceAt: 10,
    dangerAt: 30,
    source: 'BS 7967 clause 6.2.2 (from memory): 10 ppm or more find the source; 30 ppm or more make safe and evacuate, via reference sheet',
    note: MEMORY_NOTE,
  },
  SPILLAGE_RULE,
];

/*
 * Germany. Flue loss from 1. BImSchV §10 depends on rated output (11 % for 4–25 kW, 10 % above
 * 25 up to 50 kW, 9 % above 50 kW); a scope cannot tell output apart, so the preset carries the
 * domestic 4–25 kW figure and says so. The Siegert loss is not valid for condensing operation,
 * so condensing boilers get no flue-loss rule. Undiluted (air-free) CO: 500–1000 ppm maintenance,
 * above 1000 a defect; one comparator must serve both, and 'gte' keeps 500 itself in the
 * maintenance band at the cost of treating exactly 1000 as danger — the stricter reading.
 */
const FLUE_LOSS_RULE: Omit<PresetRule, 'scope'> = {
  metric: 'flue_loss_pct',
  comparator: 'gt',
  serviceAt: 11,
  dangerAt: null,
  source: '1. BImSchV §10, 11 % for 4–25 kW rated output, via reference sheet',
  note: 'For 4–25 kW rated output. The limit is 10 % above 25 kW up to 50 kW and 9 % above 50 kW: add a stricter local rule for larger appliances.',
};

const DE_RULES: PresetRule[] = [
  { ...FLUE_LOSS_RULE, scope: scope('boiler') },
  { ...FLUE_LOSS_RULE, scope: scope('furnace') },
  ...FLUED_CATEGORIES.map(
    (category): PresetRule => ({
      metric: 'co_air_free_ppm',
      scope: scope(category),
      comparator: 'gte',
      serviceAt: 500,
      dangerAt: 1000,
      source: 'German chimney-sweep practice, undiluted CO: 500–1000 ppm maintenance advised, above 1000 ppm defect, via reference sheet',
      note: null,
    }),
  ),
  SPILLAGE_RULE,
];

export const PRESETS: readonly LimitPreset[] = [
  {
    id: 'na-reference',
    name: 'North America (reference)',
    description:
      'Air-free CO maximums from the ANSI Z21 appliance standards as danger levels, service levels from the older BPI field action table, and the NREL 35 ppm ambient CO stop-testing level.',
    caution: `${COMMON_CAUTION} No CO/CO2 ratio, flue-loss or tightness-test limits: add them locally if your code has them.`,
    rules: NA_RULES,
  },
  {
    id: 'uk-reference',
    name: 'United Kingdom (reference)',
    description:
      'CO/CO2 ratio limits from BS 7967 for boilers, warm-air heaters and open-flued gas fires, trade body guidance for condensing boilers, and BS 7967 room CO levels.',
    caution: `${COMMON_CAUTION} No limits for cookers, water heaters, oil appliances, flue loss or tightness tests: add them locally.`,
    rules: UK_RULES,
  },
  {
    id: 'de-reference',
    name: 'Germany (reference)',
    description: 'Flue-loss limit from the 1. BImSchV for 4–25 kW appliances and chimney-sweep practice for undiluted CO.',
    caution: `${COMMON_CAUTION} The flue-loss figure is for 4–25 kW only. No room CO or tightness-test limits: add them locally.`,
    rules: DE_RULES,
  },
];

export function getPreset(id: string): LimitPreset | null {
  return PRESETS.find((preset) => preset.id === id) ?? null;
}

function sameTarget(a: { metric: Metric; scope: RuleScope }, b: { metric: Metric; scope: RuleScope }): boolean {
  return (
    a.metric === b.metric &&
    a.scope.category === b.scope.category &&
    a.scope.fuel === b.scope.fuel &&
    a.scope.testPoint === b.scope.testPoint
  );
}

function defaultId(): string {
  return globalThis.crypto.randomUUID();
}

/**
 * A preset's rules as limit rules ready for a profile version, each with a fresh id.
 * An override replaces the preset rule with the same metric and scope; any other override is added.
 */
export function applyPreset(
  preset: LimitPreset,
  options: { overrides?: readonly PresetRule[]; makeId?: (index: number) => string } = {},
): LimitRule[] {
  const overrides = options.overrides ?? [];
  const makeId = options.makeId ?? defaultId;
  const rules: PresetRule[] = preset.rules.map((rule) => overrides.find((o) => sameTarget(o, rule)) ?? rule);
  for (const override of overrides) {
    if (!preset.rules.some((rule) => sameTarget(rule, override))) rules.push(override);
  }
  return rules.map((rule, index) => ({
    id: makeId(index),
    metric: rule.metric,
    scope: { category: rule.scope.category, fuel: rule.scope.fuel, testPoint: rule.scope.testPoint },
    comparator: rule.comparator,
    serviceAt: rule.serviceAt,
    dangerAt: rule.dangerAt,
    source: rule.source,
    note: rule.note ?? null,
  }));
}
