import { trips, verdictRank, worstLevel } from './levels';
import { formatNumber } from './format';
import { findResolved } from './resolve';
import {
  CO_READING_METRICS,
  METRIC_LABELS,
  METRIC_UNITS,
  READING_METRICS,
  TEST_POINT_LABELS,
  type AirFreeRoute,
  type Comparator,
  type FiguresAtTestPoint,
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


/** A label inside a sentence: "air-free CO", but "CO/CO2 ratio" keeps its capitals. */
function inSentence(metric: Metric): string {
  const label = METRIC_LABELS[metric];
  return /^[A-Z][A-Z0-9]/.test(label) ? label : label.charAt(0).toLowerCase() + label.slice(1);
}

function withUnit(metric: Metric, value: number): string {
  const unit = METRIC_UNITS[metric];
  return unit === '' ? formatNumber(value) : `${formatNumber(value)} ${unit}`;
}

function whereText(testPoint: TestPoint | null, subject: string | null, minutes: number | null): string {
  if (testPoint === 'as_left') return ' as left';
  if (testPoint !== null) return ` at ${TEST_POINT_LABELS[testPoint]}`;
  if (subject !== null) return ` in ${subject}${minutes !== null ? ` over ${formatNumber(minutes)} min` : ''}`;
  return '';
}

interface RuleTexts {
  citation: string;
  service: string | null;
  danger: string | null;
}

// Resolved rules are shared by every verdict judged against the same resolution (see
// createLimitResolver), so a rule's citation and threshold wording are built once per rule
// rather than once per judged value. Only frozen rules are remembered: an unfrozen one could
// be edited between two verdicts.
const ruleTextCache = new WeakMap<ResolvedRule, RuleTexts>();

function textsFor(rule: ResolvedRule): RuleTexts {
  const cached = ruleTextCache.get(rule);
  if (cached !== undefined) return cached;
  const name = rule.profileName ? `${rule.profileName} (${rule.jurisdictionName})` : `${rule.jurisdictionName} code`;
  const origin = rule.fromOrgDefault ? `organisation default ${name}` : name;
  const texts: RuleTexts = {
    citation: `rule from ${origin}, v${rule.version}, source: ${rule.source}`,
    service: rule.serviceAt === null ? null : withUnit(rule.metric, rule.serviceAt),
    danger: rule.dangerAt === null ? null : withUnit(rule.metric, rule.dangerAt),
  };
  if (Object.isFrozen(rule)) ruleTextCache.set(rule, texts);
  return texts;
}

function ruleText(rule: ResolvedRule): string {
  return textsFor(rule).citation;
}

/** The threshold with its unit; the code's own thresholds come from the per-rule cache. */
function thresholdText(metric: Metric, limit: EffectiveLimit, reported: Threshold): string {
  if (reported.fromManufacturer || limit.rule === null) return withUnit(metric, reported.value);
  const texts = textsFor(limit.rule);
  const text = reported.kind === 'service' ? texts.service : texts.danger;
  return text ?? withUnit(metric, reported.value);
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

/**
 * The manufacturer's figure applies only where it is stricter: it replaces the service
 * level when lower than it (and lower than the danger level); a looser figure changes
 * nothing. With no code rule it alone is a service level, judged "shall not exceed".
 */
function effectiveLimit(rule: ResolvedRule | null, maker: number | null): EffectiveLimit | null {
  if (rule === null) {
    if (maker === null) return null;
    return {
      rule: null,
      comparator: 'gt',
      service: { value: maker, kind: 'service', fromManufacturer: true },
      danger: null,
      replacedService: null,
    };
  }
  const service: Threshold | null = rule.serviceAt === null ? null : { value: rule.serviceAt, kind: 'service', fromManufacturer: false };
  const danger: Threshold | null = rule.dangerAt === null ? null : { value: rule.dangerAt, kind: 'danger', fromManufacturer: false };
  const stricter = maker !== null && (service === null || maker < service.value) && (danger === null || maker < danger.value);
  if (!stricter) return { rule, comparator: rule.comparator, service, danger, replacedService: null };
  return {
    rule,
    comparator: rule.comparator,
    service: { value: maker, kind: 'service', fromManufacturer: true },
    danger,
    replacedService: service?.value ?? null,
  };
}

interface Subject {
  metric: Metric;
  testPoint: TestPoint | null;
  subject: string | null;
  minutes: number | null;
  value: number;
  airFreeRoute: AirFreeRoute | null;
}

function subjectText(s: Subject): string {
  const label = s.metric === 'co_air_free_ppm' && s.airFreeRoute !== null ? `${METRIC_LABELS[s.metric]} (${s.airFreeRoute === 'o2' ? 'O2' : 'CO2'} route)` : METRIC_LABELS[s.metric];
  return `${label} ${withUnit(s.metric, s.value)}${whereText(s.testPoint, s.subject, s.minutes)}`;
}

function baseItem(s: Subject): Omit<VerdictItem, 'level' | 'explanation'> {
  return {
    metric: s.metric,
    testPoint: s.testPoint,
    subject: s.subject,
    value: s.value,
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
    airFreeRoute: s.airFreeRoute,
  };
}

function unknownItem(s: Subject, explanation: string): VerdictItem {
  // Written out rather than spread from baseItem: built for every value no limit covers.
  return {
    metric: s.metric,
    testPoint: s.testPoint,
    subject: s.subject,
    value: s.value,
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
    airFreeRoute: s.airFreeRoute,
    level: 'unknown',
    explanation,
  };
}

function noLimitText(s: Subject): string {
  const value = s.metric === 'spillage' ? (s.value >= 1 ? 'failed' : 'passed') : withUnit(s.metric, s.value);
  return `no limit configured for ${inSentence(s.metric)}${whereText(s.testPoint, s.subject, s.minutes)}; the value ${value} cannot be judged`;
}

function provenanceText(limit: EffectiveLimit, reported: Threshold): string {
  if (reported.fromManufacturer) {
    if (limit.rule === null) return "manufacturer's figure; no code limit is configured";
    const replaced = limit.replacedService === null ? 'the code has no service level' : `stricter than ${formatNumber(limit.replacedService)} in the code`;
    return `manufacturer's figure, ${replaced}; ${ruleText(limit.rule)}`;
  }
  return limit.rule === null ? "manufacturer's figure" : ruleText(limit.rule);
}

function judgeValue(s: Subject, limit: EffectiveLimit): VerdictItem {
  let level: VerdictLevel = 'clear';
  let reported: Threshold;
  if (limit.danger !== null && trips(s.value, limit.danger.value, limit.comparator)) {
    level = 'danger';
    reported = limit.danger;
  } else if (limit.service !== null && trips(s.value, limit.service.value, limit.comparator)) {
    level = 'service';
    reported = limit.service;
  } else {
    // A limit always has at least one threshold, so one of these is present.
    reported = (limit.service ?? limit.danger)!;
  }

  let sentence: string;
  if (s.metric === 'spillage') {
    const outcome = s.value >= 1 ? 'failed' : 'passed';
    sentence =
      level === 'clear'
        ? `Spillage test ${outcome}, within the limit`
        : `Spillage test ${outcome}, which trips the ${reported.kind} level`;
  } else {
    const relation =
      level === 'clear'
        ? limit.comparator === 'gt'
          ? 'does not exceed'
          : 'is below'
        : limit.comparator === 'gt'
          ? 'is above'
          : 'is at or above';
    sentence = `${subjectText(s)} ${relation} the ${reported.kind} level ${thresholdText(s.metric, limit, reported)}`;
  }

  const rule = limit.rule;
  // Written out rather than spread from baseItem: this literal is built for every judged value.
  return {
    metric: s.metric,
    testPoint: s.testPoint,
    subject: s.subject,
    value: s.value,
    airFreeRoute: s.airFreeRoute,
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
    explanation: `${sentence} (${provenanceText(limit, reported)})`,
  };
}

function readingValue(figures: FiguresAtTestPoint, metric: ReadingMetric): { value: number | null; route: AirFreeRoute | null } {
  switch (metric) {
    case 'co_co2_ratio':
      return { value: figures.ratio, route: null };
    case 'co_as_measured_ppm':
      return { value: figures.coPpm, route: null };
    case 'flue_loss_pct':
      return { value: figures.flueLossPct, route: null };
    case 'co_air_free_ppm':
      // The O2 route is the field method the ANSI figures are applied with; CO2 is the fallback.
      if (figures.coAirFreeFromO2Ppm !== null && figures.coAirFreeFromO2Ppm !== undefined) {
        return { value: figures.coAirFreeFromO2Ppm, route: 'o2' };
      }
      if (figures.coAirFreeFromCo2Ppm !== null && figures.coAirFreeFromCo2Ppm !== undefined) {
        return { value: figures.coAirFreeFromCo2Ppm, route: 'co2' };
      }
      return { value: null, route: null };
  }
}

function limitFor(resolved: ResolvedLimits, manufacturer: JudgeInput['manufacturer'], metric: Metric, testPoint: TestPoint | null): EffectiveLimit | null {
  const rule = findResolved(resolved, metric, testPoint)?.decided ?? null;
  return effectiveLimit(rule, manufacturerFigure(manufacturer, metric));
}

function judgeOne(s: Subject, limit: EffectiveLimit | null): VerdictItem {
  if (!Number.isFinite(s.value)) {
    return unknownItem(s, `${METRIC_LABELS[s.metric]}${whereText(s.testPoint, s.subject, s.minutes)} is not a usable number and cannot be judged`);
  }
  return limit === null ? unknownItem(s, noLimitText(s)) : judgeValue(s, limit);
}

function judgeReadings(input: JudgeInput, items: VerdictItem[], notJudged: NotJudgedFigure[]): void {
  for (const figures of input.figures) {
    const judged: VerdictItem[] = [];
    const unlimited: Subject[] = [];
    for (const metric of READING_METRICS) {
      const { value, route } = readingValue(figures, metric);
      if (value === null || value === undefined) continue; // not measured
      const s: Subject = { metric, testPoint: figures.testPoint, subject: null, minutes: null, value, airFreeRoute: route };
      const limit = limitFor(input.resolved, input.manufacturer, metric, figures.testPoint);
      if (limit === null && Number.isFinite(value)) unlimited.push(s);
      else judged.push(judgeOne(s, limit));
    }
    // A reading whose CO met no limit at all is unknown; once some CO measure was judged, a
    // figure the limits do not cover (air-free CO under a ratio-only code) is listed, not scored.
    const coJudged = judged.some((item) => (CO_READING_METRICS as readonly Metric[]).includes(item.metric) && item.level !== 'unknown');
    const judgedInOrder = judged.length;
    for (const s of unlimited) {
      if ((CO_READING_METRICS as readonly Metric[]).includes(s.metric) && !coJudged) {
        judged.push(unknownItem(s, noLimitText(s)));
      } else {
        notJudged.push({
          metric: s.metric,
          testPoint: s.testPoint,
          value: s.value,
          explanation: `${subjectText(s)} was not judged: no limit is configured for it, and CO was judged by another measure`,
        });
      }
    }
    // The loop above pushed in READING_METRICS order; only unknowns appended since need placing.
    if (judged.length > judgedInOrder) {
      judged.sort((a, b) => READING_METRICS.indexOf(a.metric as ReadingMetric) - READING_METRICS.indexOf(b.metric as ReadingMetric));
    }
    items.push(...judged);
  }

  // Checked first: almost every inspection has a judged reading, and then the scan below is moot.
  const anyReadingItem = items.some((item) => (READING_METRICS as readonly Metric[]).includes(item.metric));
  if (anyReadingItem) return;
  const limitedMetrics = READING_METRICS.filter(
    (metric) =>
      manufacturerFigure(input.manufacturer, metric) !== null ||
      input.resolved.entries.some((entry) => entry.metric === metric && entry.decided !== null),
  );
  if (limitedMetrics.length > 0) {
    const names = limitedMetrics.map(inSentence).join(', ');
    items.push({
      ...baseItem({ metric: limitedMetrics[0]!, testPoint: null, subject: null, minutes: null, value: 0, airFreeRoute: null }),
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

  judgeReadings(input, items, notJudged);

  for (const check of input.roomChecks ?? []) {
    const s: Subject = {
      metric: 'room_co_ppm',
      testPoint: null,
      subject: check.room,
      minutes: typeof check.minutes === 'number' && Number.isFinite(check.minutes) ? check.minutes : null,
      value: check.coPpm,
      airFreeRoute: null,
    };
    items.push(judgeOne(s, limitFor(input.resolved, null, 'room_co_ppm', null)));
  }

  if (input.spillage === 'pass' || input.spillage === 'fail') {
    const s: Subject = { metric: 'spillage', testPoint: null, subject: null, minutes: null, value: input.spillage === 'fail' ? 1 : 0, airFreeRoute: null };
    items.push(judgeOne(s, limitFor(input.resolved, null, 'spillage', null)));
  }

  if (input.tightnessDropMbar !== null && input.tightnessDropMbar !== undefined) {
    const s: Subject = { metric: 'tightness_drop_mbar', testPoint: null, subject: null, minutes: null, value: input.tightnessDropMbar, airFreeRoute: null };
    items.push(judgeOne(s, limitFor(input.resolved, null, 'tightness_drop_mbar', null)));
  }

  const overall = worstLevel(items.map((item) => item.level));
  const decidedBy = overall === 'clear' ? null : (items.find((item) => verdictRank(item.level) === verdictRank(overall)) ?? null);
  return { overall, items, decidedBy, notJudged };
}
