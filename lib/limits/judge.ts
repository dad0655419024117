import { trips } from './levels';
import { formatNumber } from './format';
import { findResolved } from './resolve';
import {
  CO_READING_METRICS,
  METRICS,
  METRIC_LABELS,
  METRIC_UNITS,
  READING_METRICS,
  TEST_POINTS,
  TEST_POINT_LABELS,
  type AirFreeRoute,
  type Comparator,
  type JudgeInput,
  type ManufacturerLimits,
  type Metric,
  type NotJudgedFigure,
  type ReadingMetric,
  type ResolvedLimits,
  type ResolvedRule,
  type TestPoint,
  type Verdict,
  type VerdictItem,
  type VerdictLevel,
} from './types';

const MANUFACTURER_SOURCE = "manufacturer's instructions";

// Judging runs once per appliance in a bulk import or a day's submissions (tens of thousands of
// times), so the wording that does not depend on the measured value is built once: per metric
// and test point in the tables below, and per rule in the limit cache further down. Only the
// value itself is formatted per judged figure.

/** A label inside a sentence: "air-free CO", but "CO/CO2 ratio" keeps its capitals. */
function inSentenceOf(label: string): string {
  return /^[A-Z][A-Z0-9]/.test(label) ? label : label.charAt(0).toLowerCase() + label.slice(1);
}

const IN_SENTENCE = Object.fromEntries(Object.entries(METRIC_LABELS).map(([metric, label]) => [metric, inSentenceOf(label)])) as Record<Metric, string>;
const LABEL: Record<Metric, string> = { ...METRIC_LABELS };
/** " ppm", " %", or nothing for the dimensionless ratio and the pass/fail spillage test. */
const UNIT_SUFFIX = Object.fromEntries(Object.entries(METRIC_UNITS).map(([metric, unit]) => [metric, unit === '' ? '' : ` ${unit}`])) as Record<Metric, string>;
const AIR_FREE_LABEL: Record<AirFreeRoute, string> = {
  o2: `${METRIC_LABELS.co_air_free_ppm} (O2 route)`,
  co2: `${METRIC_LABELS.co_air_free_ppm} (CO2 route)`,
};
const AT_POINT = Object.fromEntries(Object.entries(TEST_POINT_LABELS).map(([point, label]) => [point, point === 'as_left' ? ' as left' : ` at ${label}`])) as Record<TestPoint, string>;
const READINGS: readonly ReadingMetric[] = READING_METRICS;
const CO_METRICS: readonly Metric[] = CO_READING_METRICS;
const RANK: Record<VerdictLevel, number> = { clear: 0, unknown: 1, service: 2, danger: 3 };

function inSentence(metric: Metric): string {
  return IN_SENTENCE[metric];
}

function withUnit(metric: Metric, value: number): string {
  return formatNumber(value) + UNIT_SUFFIX[metric];
}

function whereText(testPoint: TestPoint | null, subject: string | null, minutes: number | null): string {
  if (testPoint !== null) return AT_POINT[testPoint];
  if (subject !== null) return ` in ${subject}${minutes !== null ? ` over ${formatNumber(minutes)} min` : ''}`;
  return '';
}

function citationOf(rule: ResolvedRule): string {
  const name = rule.profileName ? `${rule.profileName} (${rule.jurisdictionName})` : `${rule.jurisdictionName} code`;
  const origin = rule.fromOrgDefault ? `organisation default ${name}` : name;
  return `rule from ${origin}, v${rule.version}, source: ${rule.source}`;
}

interface Threshold {
  value: number;
  kind: 'service' | 'danger';
  fromManufacturer: boolean;
}

/** The thresholds that apply once a manufacturer's figure is folded in. */
interface EffectiveLimit {
  rule: ResolvedRule | null;
  comparator: Comparator;
  service: Threshold | null;
  danger: Threshold | null;
  /** The code's own service level when the manufacturer's figure replaced it. */
  replacedService: number | null;
  /**
   * Everything an explanation says after the value and where it was taken, per outcome
   * (index 0 clear, 1 service, 2 danger), filled in on first use. Only a limit built from a
   * frozen rule keeps it, since only that one is shared between verdicts.
   */
  tails: [string | null, string | null, string | null] | null;
}

function manufacturerFigure(manufacturer: ManufacturerLimits | null | undefined, metric: Metric): number | null {
  if (!manufacturer) return null;
  const raw =
    metric === 'co_co2_ratio'
      ? manufacturer.coCo2Ratio
      : metric === 'co_air_free_ppm'
        ? manufacturer.coAirFreePpm
        : metric === 'co_as_measured_ppm'
          ? manufacturer.coAsMeasuredPpm
          : null;
  // A blank, zero or non-numeric entry is no figure at all; the code limit still applies.
  return typeof raw === 'number' && Number.isFinite(raw) && raw > 0 ? raw : null;
}

function codeLimit(rule: ResolvedRule, shared: boolean): EffectiveLimit {
  return {
    rule,
    comparator: rule.comparator,
    service: rule.serviceAt === null ? null : { value: rule.serviceAt, kind: 'service', fromManufacturer: false },
    danger: rule.dangerAt === null ? null : { value: rule.dangerAt, kind: 'danger', fromManufacturer: false },
    replacedService: null,
    tails: shared ? [null, null, null] : null,
  };
}

/**
 * The manufacturer's figure applies only where it is stricter: it replaces the service
 * level when lower than it (and lower than the danger level); a looser figure changes
 * nothing. With no code rule it alone is a service level, judged "shall not exceed".
 */
function withManufacturer(code: EffectiveLimit | null, maker: number | null): EffectiveLimit | null {
  if (maker === null) return code;
  if (code === null) {
    return {
      rule: null,
      comparator: 'gt',
      service: { value: maker, kind: 'service', fromManufacturer: true },
      danger: null,
      replacedService: null,
      tails: null,
    };
  }
  const stricter = (code.service === null || maker < code.service.value) && (code.danger === null || maker < code.danger.value);
  if (!stricter) return code;
  return {
    rule: code.rule,
    comparator: code.comparator,
    service: { value: maker, kind: 'service', fromManufacturer: true },
    danger: code.danger,
    replacedService: code.service?.value ?? null,
    tails: null,
  };
}

const METRIC_INDEX = Object.fromEntries(METRICS.map((metric, i) => [metric, i])) as Record<Metric, number>;
const POINT_INDEX = Object.fromEntries(TEST_POINTS.map((point, i) => [point, i])) as Record<TestPoint, number>;
const POINTS_PER_METRIC = TEST_POINTS.length + 1;

/** The code's own limit per (metric, test point) of one resolution; undefined where not looked up yet. */
type LimitPlan = Array<EffectiveLimit | null | undefined>;

// Resolutions from createLimitResolver are deep-frozen and shared by every appliance of a kind
// judged on a day, so the code's limit for each slot, with its wording, is built once per
// resolution rather than once per judged value. Only frozen resolutions are remembered: an
// unfrozen one could be edited between two verdicts.
const planCache = new WeakMap<ResolvedLimits, LimitPlan>();

function planFor(resolved: ResolvedLimits): LimitPlan | null {
  if (!Object.isFrozen(resolved) || !Object.isFrozen(resolved.entries)) return null;
  let plan = planCache.get(resolved);
  if (plan === undefined) {
    plan = new Array<EffectiveLimit | null | undefined>(METRICS.length * POINTS_PER_METRIC).fill(undefined);
    planCache.set(resolved, plan);
  }
  return plan;
}

function codeLimitAt(resolved: ResolvedLimits, plan: LimitPlan | null, metric: Metric, testPoint: TestPoint | null): EffectiveLimit | null {
  const index = METRIC_INDEX[metric] * POINTS_PER_METRIC + (testPoint === null ? TEST_POINTS.length : POINT_INDEX[testPoint]);
  if (plan !== null) {
    const known = plan[index];
    if (known !== undefined) return known;
  }
  const entry = findResolved(resolved, metric, testPoint);
  const rule = entry?.decided ?? null;
  const shared = plan !== null && (entry === null || (Object.isFrozen(entry) && (rule === null || Object.isFrozen(rule))));
  const limit = rule === null ? null : codeLimit(rule, shared);
  if (shared) plan[index] = limit;
  return limit;
}

function limitFor(input: JudgeInput, plan: LimitPlan | null, manufacturer: JudgeInput['manufacturer'], metric: Metric, testPoint: TestPoint | null): EffectiveLimit | null {
  return withManufacturer(codeLimitAt(input.resolved, plan, metric, testPoint), manufacturerFigure(manufacturer, metric));
}

function labelOf(metric: Metric, airFreeRoute: AirFreeRoute | null): string {
  return metric === 'co_air_free_ppm' && airFreeRoute !== null ? AIR_FREE_LABEL[airFreeRoute] : LABEL[metric];
}

function subjectText(metric: Metric, testPoint: TestPoint | null, subject: string | null, minutes: number | null, value: number, airFreeRoute: AirFreeRoute | null): string {
  return `${labelOf(metric, airFreeRoute)} ${withUnit(metric, value)}${whereText(testPoint, subject, minutes)}`;
}

function unknownItem(
  metric: Metric,
  testPoint: TestPoint | null,
  subject: string | null,
  value: number,
  airFreeRoute: AirFreeRoute | null,
  explanation: string,
): VerdictItem {
  return {
    metric,
    testPoint,
    subject,
    value,
    threshold: null,
    thresholdKind: null,
    comparator: null,
    ruleId: null,
    profileId: null,
    version: null,
    jurisdictionId: null,
    jurisdictionName: null,
    source: null,
    fromManufacturer: false,
    airFreeRoute,
    level: 'unknown',
    explanation,
  };
}

function noLimitText(metric: Metric, testPoint: TestPoint | null, subject: string | null, minutes: number | null, value: number): string {
  const shown = metric === 'spillage' ? (value >= 1 ? 'failed' : 'passed') : withUnit(metric, value);
  return `no limit configured for ${inSentence(metric)}${whereText(testPoint, subject, minutes)}; the value ${shown} cannot be judged`;
}

function provenanceText(limit: EffectiveLimit, reported: Threshold): string {
  if (reported.fromManufacturer) {
    if (limit.rule === null) return "manufacturer's figure; no code limit is configured";
    const replaced = limit.replacedService === null ? 'the code has no service level' : `stricter than ${formatNumber(limit.replacedService)} in the code`;
    return `manufacturer's figure, ${replaced}; ${citationOf(limit.rule)}`;
  }
  return limit.rule === null ? "manufacturer's figure" : citationOf(limit.rule);
}

/** " is above the service level 0.008 (rule from …)": what follows the value and where, for one outcome. */
function tailText(metric: Metric, limit: EffectiveLimit, level: VerdictLevel, reported: Threshold): string {
  const relation =
    level === 'clear'
      ? limit.comparator === 'gt'
        ? 'does not exceed'
        : 'is below'
      : limit.comparator === 'gt'
        ? 'is above'
        : 'is at or above';
  return ` ${relation} the ${reported.kind} level ${withUnit(metric, reported.value)} (${provenanceText(limit, reported)})`;
}

function judgeValue(
  metric: Metric,
  testPoint: TestPoint | null,
  subject: string | null,
  minutes: number | null,
  value: number,
  airFreeRoute: AirFreeRoute | null,
  limit: EffectiveLimit,
): VerdictItem {
  let level: VerdictLevel = 'clear';
  let reported: Threshold;
  let outcome = 0;
  if (limit.danger !== null && trips(value, limit.danger.value, limit.comparator)) {
    level = 'danger';
    reported = limit.danger;
    outcome = 2;
  } else if (limit.service !== null && trips(value, limit.service.value, limit.comparator)) {
    level = 'service';
    reported = limit.service;
    outcome = 1;
  } else {
    // A limit always has at least one threshold, so one of these is present.
    reported = (limit.service ?? limit.danger)!;
  }

  let explanation: string;
  if (metric === 'spillage') {
    const result = value >= 1 ? 'failed' : 'passed';
    const sentence = level === 'clear' ? `Spillage test ${result}, within the limit` : `Spillage test ${result}, which trips the ${reported.kind} level`;
    explanation = `${sentence} (${provenanceText(limit, reported)})`;
  } else {
    const tails = limit.tails;
    let tail = tails === null ? null : tails[outcome]!;
    if (tail === null) {
      tail = tailText(metric, limit, level, reported);
      if (tails !== null) tails[outcome] = tail;
    }
    explanation = subjectText(metric, testPoint, subject, minutes, value, airFreeRoute) + tail;
  }

  const rule = limit.rule;
  return {
    metric,
    testPoint,
    subject,
    value,
    airFreeRoute,
    level,
    threshold: reported.value,
    thresholdKind: reported.kind,
    comparator: limit.comparator,
    ruleId: rule?.ruleId ?? null,
    profileId: rule?.profileId ?? null,
    version: rule?.version ?? null,
    jurisdictionId: rule?.jurisdictionId ?? null,
    jurisdictionName: rule?.jurisdictionName ?? null,
    source: reported.fromManufacturer ? MANUFACTURER_SOURCE : (rule?.source ?? null),
    fromManufacturer: reported.fromManufacturer,
    explanation,
  };
}

function judgeOne(
  metric: Metric,
  testPoint: TestPoint | null,
  subject: string | null,
  minutes: number | null,
  value: number,
  airFreeRoute: AirFreeRoute | null,
  limit: EffectiveLimit | null,
): VerdictItem {
  if (!Number.isFinite(value)) {
    return unknownItem(metric, testPoint, subject, value, airFreeRoute, `${LABEL[metric]}${whereText(testPoint, subject, minutes)} is not a usable number and cannot be judged`);
  }
  if (limit === null) return unknownItem(metric, testPoint, subject, value, airFreeRoute, noLimitText(metric, testPoint, subject, minutes, value));
  return judgeValue(metric, testPoint, subject, minutes, value, airFreeRoute, limit);
}

/** Per reading metric, in READING_METRICS order: the judged item, or null for a finite value no limit covers. */
const pendingItems: Array<VerdictItem | null> = [];
const pendingValues: number[] = [];
const pendingRoutes: Array<AirFreeRoute | null> = [];
const pendingMeasured: boolean[] = [];

function judgeReadings(input: JudgeInput, plan: LimitPlan | null, items: VerdictItem[], notJudged: NotJudgedFigure[]): void {
  const readingItemsBefore = items.length;
  for (const figures of input.figures) {
    const testPoint = figures.testPoint;
    let coJudged = false;
    for (let m = 0; m < READINGS.length; m++) {
      const metric = READINGS[m]!;
      let value: number | null | undefined;
      let route: AirFreeRoute | null = null;
      switch (metric) {
        case 'co_co2_ratio':
          value = figures.ratio;
          break;
        case 'co_as_measured_ppm':
          value = figures.coPpm;
          break;
        case 'flue_loss_pct':
          value = figures.flueLossPct;
          break;
        case 'co_air_free_ppm':
          // The O2 route is the field method the ANSI figures are applied with; CO2 is the fallback.
          if (figures.coAirFreeFromO2Ppm !== null && figures.coAirFreeFromO2Ppm !== undefined) {
            value = figures.coAirFreeFromO2Ppm;
            route = 'o2';
          } else if (figures.coAirFreeFromCo2Ppm !== null && figures.coAirFreeFromCo2Ppm !== undefined) {
            value = figures.coAirFreeFromCo2Ppm;
            route = 'co2';
          } else {
            value = null;
          }
          break;
      }
      pendingItems[m] = null;
      pendingMeasured[m] = value !== null && value !== undefined;
      if (value === null || value === undefined) continue; // not measured
      pendingValues[m] = value;
      pendingRoutes[m] = route;
      const limit = limitFor(input, plan, input.manufacturer, metric, testPoint);
      if (limit === null && Number.isFinite(value)) continue; // placed below, once CO is known to be judged or not
      const item = judgeOne(metric, testPoint, null, null, value, route, limit);
      pendingItems[m] = item;
      if (item.level !== 'unknown' && CO_METRICS.includes(metric)) coJudged = true;
    }
    // A reading whose CO met no limit at all is unknown; once some CO measure was judged, a
    // figure the limits do not cover (air-free CO under a ratio-only code) is listed, not scored.
    for (let m = 0; m < READINGS.length; m++) {
      if (!pendingMeasured[m]) continue;
      const item = pendingItems[m];
      if (item !== null) {
        items.push(item);
        continue;
      }
      const metric = READINGS[m]!;
      const value = pendingValues[m]!;
      const route = pendingRoutes[m]!;
      if (CO_METRICS.includes(metric) && !coJudged) {
        items.push(unknownItem(metric, testPoint, null, value, route, noLimitText(metric, testPoint, null, null, value)));
      } else {
        notJudged.push({
          metric,
          testPoint,
          value,
          explanation: `${subjectText(metric, testPoint, null, null, value, route)} was not judged: no limit is configured for it, and CO was judged by another measure`,
        });
      }
    }
  }

  // Checked first: almost every inspection has a judged reading, and then the scan below is moot.
  if (items.length > readingItemsBefore) return;
  const limitedMetrics = READING_METRICS.filter(
    (metric) =>
      manufacturerFigure(input.manufacturer, metric) !== null ||
      input.resolved.entries.some((entry) => entry.metric === metric && entry.decided !== null),
  );
  if (limitedMetrics.length > 0) {
    const names = limitedMetrics.map(inSentence).join(', ');
    items.push({
      ...unknownItem(limitedMetrics[0]!, null, null, 0, null, ''),
      value: null,
      level: 'unknown',
      explanation: `No analyser reading could be judged: limits are configured for ${names} but no value was recorded`,
    });
  }
}

/**
 * The verdict for one appliance's inspection. Overall is the worst item level
 * (danger > service > unknown > clear); nothing judged at all is 'unknown', never 'clear'.
 */
export function judge(input: JudgeInput): Verdict {
  const items: VerdictItem[] = [];
  const notJudged: NotJudgedFigure[] = [];

  const plan = planFor(input.resolved);
  judgeReadings(input, plan, items, notJudged);

  const roomChecks = input.roomChecks;
  if (roomChecks && roomChecks.length > 0) {
    const limit = limitFor(input, plan, null, 'room_co_ppm', null);
    for (const check of roomChecks) {
      const minutes = typeof check.minutes === 'number' && Number.isFinite(check.minutes) ? check.minutes : null;
      items.push(judgeOne('room_co_ppm', null, check.room, minutes, check.coPpm, null, limit));
    }
  }

  if (input.spillage === 'pass' || input.spillage === 'fail') {
    items.push(judgeOne('spillage', null, null, null, input.spillage === 'fail' ? 1 : 0, null, limitFor(input, plan, null, 'spillage', null)));
  }

  if (input.tightnessDropMbar !== null && input.tightnessDropMbar !== undefined) {
    items.push(judgeOne('tightness_drop_mbar', null, null, null, input.tightnessDropMbar, null, limitFor(input, plan, null, 'tightness_drop_mbar', null)));
  }

  // The worst level, and the first item at it; nothing judged at all is unknown.
  let overall: VerdictLevel = items.length === 0 ? 'unknown' : 'clear';
  let decidedBy: VerdictItem | null = null;
  for (const item of items) {
    if (RANK[item.level] > RANK[overall]) {
      overall = item.level;
      decidedBy = item;
    }
  }
  return { overall, items, decidedBy: overall === 'clear' ? null : decidedBy, notJudged };
}
