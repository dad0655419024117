// Vocabulary and shapes for limit rules, their resolution and the verdict.
// Everything here is plain JSON: the browser caches a site's resolved limits for offline use.

// Same literal members as lib/combustion's FuelId; kept local so this module stands alone.
export type FuelId = 'natural-gas' | 'propane' | 'butane' | 'kerosene' | 'gas-oil';

export const FUEL_IDS = ['natural-gas', 'propane', 'butane', 'kerosene', 'gas-oil'] as const satisfies readonly FuelId[];

export const FUEL_LABELS: Record<FuelId, string> = {
  'natural-gas': 'Natural gas',
  propane: 'Propane',
  butane: 'Butane',
  kerosene: 'Kerosene',
  'gas-oil': 'Gas oil',
};

export const METRICS = [
  'co_co2_ratio',
  'co_air_free_ppm',
  'co_as_measured_ppm',
  'room_co_ppm',
  'flue_loss_pct',
  'spillage',
  'tightness_drop_mbar',
] as const;

export type Metric = (typeof METRICS)[number];

export const METRIC_LABELS: Record<Metric, string> = {
  co_co2_ratio: 'CO/CO2 ratio',
  co_air_free_ppm: 'Air-free CO',
  co_as_measured_ppm: 'CO as measured',
  room_co_ppm: 'Room CO',
  flue_loss_pct: 'Flue loss',
  spillage: 'Spillage test',
  tightness_drop_mbar: 'Tightness test pressure drop',
};

// Empty string = dimensionless (the ratio) or pass/fail (spillage: 1 = fail, 0 = pass).
export const METRIC_UNITS: Record<Metric, string> = {
  co_co2_ratio: '',
  co_air_free_ppm: 'ppm',
  co_as_measured_ppm: 'ppm',
  room_co_ppm: 'ppm',
  flue_loss_pct: '%',
  spillage: '',
  tightness_drop_mbar: 'mbar',
};

// Judged per analyser reading at its test point; the rest are judged once per room check or inspection.
export const READING_METRICS = ['co_co2_ratio', 'co_air_free_ppm', 'co_as_measured_ppm', 'flue_loss_pct'] as const satisfies readonly Metric[];
export type ReadingMetric = (typeof READING_METRICS)[number];

// The flue-gas CO measures: a reading counts as judged for CO only if one of these met a limit.
export const CO_READING_METRICS = ['co_co2_ratio', 'co_air_free_ppm', 'co_as_measured_ppm'] as const satisfies readonly ReadingMetric[];

export function isReadingMetric(metric: Metric): metric is ReadingMetric {
  return (READING_METRICS as readonly Metric[]).includes(metric);
}

export const APPLIANCE_CATEGORIES = [
  'boiler',
  'condensing_boiler',
  'furnace',
  'water_heater',
  'space_heater',
  'unvented_heater',
  'cooker',
  'other',
] as const;

export type ApplianceCategory = (typeof APPLIANCE_CATEGORIES)[number];

export const APPLIANCE_CATEGORY_LABELS: Record<ApplianceCategory, string> = {
  boiler: 'Boiler',
  condensing_boiler: 'Condensing boiler',
  furnace: 'Furnace / warm-air heater',
  water_heater: 'Water heater',
  space_heater: 'Space heater / gas fire (flued)',
  unvented_heater: 'Unvented (flueless) heater',
  cooker: 'Cooker / range / oven',
  other: 'Other',
};

export const TEST_POINTS = ['high_fire', 'low_fire', 'as_left'] as const;
export type TestPoint = (typeof TEST_POINTS)[number];

export const TEST_POINT_LABELS: Record<TestPoint, string> = {
  high_fire: 'high fire',
  low_fire: 'low fire',
  as_left: 'as left',
};

export const VERDICT_LEVELS = ['clear', 'service', 'danger', 'unknown'] as const;
export type VerdictLevel = (typeof VERDICT_LEVELS)[number];

export const COMPARATORS = ['gt', 'gte'] as const;
/** `gt`: a value strictly above the threshold trips it; `gte`: a value at or above trips it. */
export type Comparator = (typeof COMPARATORS)[number];

/** null in a scope field means "any". */
export interface RuleScope {
  category: ApplianceCategory | null;
  fuel: FuelId | null;
  testPoint: TestPoint | null;
}

export interface LimitRule {
  id: string;
  metric: Metric;
  scope: RuleScope;
  comparator: Comparator;
  serviceAt: number | null;
  dangerAt: number | null;
  source: string;
  note?: string | null;
}

export interface ProfileVersion {
  profileId: string;
  version: number;
  /** YYYY-MM-DD */
  effectiveFrom: string;
  rules: LimitRule[];
}

export interface JurisdictionLevel {
  jurisdictionId: string;
  name: string;
  profileName?: string;
  versions: ProfileVersion[];
}

export interface ApplianceKey {
  category: ApplianceCategory;
  fuel: FuelId;
}

export interface ResolveLimitsInput {
  /** Most local first (e.g. town, region, nation). */
  chain: JurisdictionLevel[];
  orgDefault: JurisdictionLevel | null;
  appliance: ApplianceKey;
  /** YYYY-MM-DD: the date of the readings, which picks the profile version in force. */
  date: string;
  /** Also list rules of the metric whose scope does not match this appliance (reason 'out_of_scope'). */
  includeOutOfScope?: boolean;
}

/** One rule as it applied (or was passed over), with where it came from. */
export interface ResolvedRule {
  ruleId: string;
  metric: Metric;
  scope: RuleScope;
  comparator: Comparator;
  serviceAt: number | null;
  dangerAt: number | null;
  source: string;
  note: string | null;
  jurisdictionId: string;
  jurisdictionName: string;
  profileName: string | null;
  profileId: string;
  version: number;
  effectiveFrom: string;
  fromOrgDefault: boolean;
  /** Count of non-null scope fields. */
  specificity: number;
}

export type PassOverReason =
  /** A more local level already decided this metric. */
  | 'less_local'
  /** Same profile, a rule with more non-null scope fields decided. */
  | 'less_specific'
  /** Same profile and same specificity: the first-defined rule decided. */
  | 'later_defined'
  /** The scope names another category, fuel or test point. */
  | 'out_of_scope'
  /** The rule's profile version was not the one in force on the date. */
  | 'not_in_force';

export interface PassedOverRule extends ResolvedRule {
  reason: PassOverReason;
}

export interface ResolvedEntry {
  metric: Metric;
  /** The test point for reading metrics; null for room CO, spillage and tightness. */
  testPoint: TestPoint | null;
  decided: ResolvedRule | null;
  passedOver: PassedOverRule[];
}

/** Which profile version each level contributed on the date (null: none in force). */
export interface ResolvedLevel {
  jurisdictionId: string;
  jurisdictionName: string;
  fromOrgDefault: boolean;
  profileId: string | null;
  version: number | null;
  effectiveFrom: string | null;
}

export interface ResolvedLimits {
  appliance: ApplianceKey;
  date: string;
  levels: ResolvedLevel[];
  /** One entry per metric and slot: reading metrics × TEST_POINTS, then the others with testPoint null. */
  entries: ResolvedEntry[];
}

/**
 * Derived flue-gas figures for one reading. Structural on purpose: lib/combustion's
 * FlueGasAnalysis is assignable to it without this module importing that one.
 */
export interface JudgeableFigures {
  coPpm: number;
  ratio: number | null;
  coAirFreeFromO2Ppm: number | null;
  coAirFreeFromCo2Ppm: number | null;
  flueLossPct: number | null;
}

export interface FiguresAtTestPoint extends JudgeableFigures {
  testPoint: TestPoint;
}

export interface RoomCheckInput {
  room: string;
  coPpm: number;
  minutes?: number | null;
}

export interface ManufacturerLimits {
  coCo2Ratio?: number | null;
  coAirFreePpm?: number | null;
  coAsMeasuredPpm?: number | null;
}

export interface JudgeInput {
  figures: FiguresAtTestPoint[];
  roomChecks?: RoomCheckInput[];
  spillage?: 'pass' | 'fail' | null;
  tightnessDropMbar?: number | null;
  resolved: ResolvedLimits;
  manufacturer?: ManufacturerLimits | null;
}

export type AirFreeRoute = 'o2' | 'co2';

export interface VerdictItem {
  metric: Metric;
  testPoint: TestPoint | null;
  /** Room name for room checks; null otherwise. */
  subject: string | null;
  value: number | null;
  level: VerdictLevel;
  /** The threshold tripped; when clear, the service threshold (or the danger one if there is no service level). */
  threshold: number | null;
  thresholdKind: 'service' | 'danger' | null;
  comparator: Comparator | null;
  ruleId: string | null;
  profileId: string | null;
  version: number | null;
  jurisdictionId: string | null;
  jurisdictionName: string | null;
  source: string | null;
  /** The reported threshold is the manufacturer's figure. */
  fromManufacturer: boolean;
  /** For air-free CO: which correction produced the value. */
  airFreeRoute: AirFreeRoute | null;
  explanation: string;
}

/** A measured figure left out of the verdict because no limit covers it while other CO measures were judged. */
export interface NotJudgedFigure {
  metric: Metric;
  testPoint: TestPoint | null;
  value: number;
  explanation: string;
}

export interface Verdict {
  overall: VerdictLevel;
  items: VerdictItem[];
  /** First item at the overall level; null when overall is clear (every item together decides) or nothing was judged. */
  decidedBy: VerdictItem | null;
  notJudged: NotJudgedFigure[];
}
