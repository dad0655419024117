// The verdict for a visit from its raw records: lib/combustion turns each reading into figures,
// lib/limits resolves and judges them. The phone runs this live and offline; the server runs the
// very same code on submit, and its answer is the verdict of record.
import { analyseFlueGas, CombustionInputError, type FlueGasAnalysis } from '../combustion';
import { judge, resolveLimits, worstLevel, type ApplianceKey, type Metric, type ResolvedLimits, type Verdict, type VerdictLevel } from '../limits';
import type { ApplianceDetails, CheckAnswer, FindingSeverity } from '../validations/inspection';
import type { LimitContext, RecordedReading } from './types';

/** Readings no later reading replaces, in test-point order then time. Superseded ones stay stored, unjudged. */
export function currentReadings<T extends { id: string; replacesId: string | null; testPoint: string; takenAt: string }>(readings: readonly T[]): T[] {
  const replaced = new Set(readings.map((r) => r.replacesId).filter((id): id is string => id !== null));
  const order = ['high_fire', 'low_fire', 'as_left'];
  return readings
    .filter((r) => !replaced.has(r.id))
    .sort((a, b) => order.indexOf(a.testPoint) - order.indexOf(b.testPoint) || a.takenAt.localeCompare(b.takenAt));
}

export type ReadingAnalysis =
  | { reading: RecordedReading; analysis: FlueGasAnalysis; error: null }
  | { reading: RecordedReading; analysis: null; error: { field: string; message: string } };

export function analyseReading(reading: Omit<RecordedReading, 'id' | 'testPoint' | 'takenAt' | 'replacesId' | 'analyserId' | 'tempUnit'>, fuel: ApplianceDetails['fuel']): { analysis: FlueGasAnalysis; error: null } | { analysis: null; error: { field: string; message: string } } {
  try {
    const analysis = analyseFlueGas({
      fuel,
      coPpm: reading.coPpm,
      ...(reading.co2Pct !== null ? { co2Pct: reading.co2Pct } : {}),
      ...(reading.o2Pct !== null ? { o2Pct: reading.o2Pct } : {}),
      ...(reading.flueTempC !== null ? { flueTempC: reading.flueTempC } : {}),
      ...(reading.airTempC !== null ? { airTempC: reading.airTempC } : {}),
    });
    return { analysis, error: null };
  } catch (err) {
    if (err instanceof CombustionInputError) return { analysis: null, error: { field: err.field, message: err.message } };
    throw err;
  }
}

export type ApplianceVerdict = {
  resolved: ResolvedLimits;
  verdict: Verdict;
  readings: ReadingAnalysis[];
};

export type ApplianceVerdictInput = {
  details: ApplianceDetails;
  readings: readonly RecordedReading[];
  spillage: CheckAnswer | null;
  limits: LimitContext;
  /** YYYY-MM-DD: picks the limit versions in force. */
  date: string;
};

export function applianceKey(details: ApplianceDetails): ApplianceKey {
  return { category: details.category, fuel: details.fuel };
}

export function applianceVerdict(input: ApplianceVerdictInput): ApplianceVerdict {
  const resolved = resolveLimits({ chain: input.limits.chain, orgDefault: input.limits.orgDefault, appliance: applianceKey(input.details), date: input.date });
  const readings: ReadingAnalysis[] = currentReadings(input.readings).map((reading) => ({ reading, ...analyseReading(reading, input.details.fuel) }) as ReadingAnalysis);
  const figures = readings.flatMap((r) => (r.analysis ? [{ ...r.analysis, testPoint: r.reading.testPoint }] : []));
  const verdict = judge({
    figures,
    spillage: input.spillage === 'pass' || input.spillage === 'fail' ? input.spillage : null,
    resolved,
    manufacturer: {
      coCo2Ratio: input.details.mfrRatioMax,
      coAirFreePpm: input.details.mfrCoAirFreeMaxPpm,
      coAsMeasuredPpm: input.details.mfrCoMaxPpm,
    },
  });
  return { resolved, verdict, readings };
}

const INSTALLATION_METRICS: readonly Metric[] = ['room_co_ppm', 'tightness_drop_mbar'];

export type InstallationInput = {
  roomChecks: ReadonlyArray<{ room: string; coPpm: number; minutes: number | null }>;
  tightness: { startMbar: number; endMbar: number; durationMin: number } | null;
  /** The fuels of the appliances at the site; a gas fuel is preferred for the tightness test's scope. */
  fuels: ReadonlyArray<ApplianceDetails['fuel']>;
  limits: LimitContext;
  date: string;
};

export type InstallationVerdict = { resolved: ResolvedLimits; verdict: Verdict; tightnessDropMbar: number | null };

/**
 * Room CO and the tightness test belong to the installation, not to one appliance. They are judged
 * once, with the installation scoped as category 'other' and the site's (preferably gas) fuel,
 * so rules scoped to any category apply. Null when neither was recorded.
 */
export function installationVerdict(input: InstallationInput): InstallationVerdict | null {
  if (input.roomChecks.length === 0 && input.tightness === null) return null;
  const gas = input.fuels.find((f) => f === 'natural-gas' || f === 'propane' || f === 'butane');
  const fuel = gas ?? input.fuels[0] ?? 'natural-gas';
  const resolved = resolveLimits({ chain: input.limits.chain, orgDefault: input.limits.orgDefault, appliance: { category: 'other', fuel }, date: input.date });
  const tightnessDropMbar = input.tightness ? Number((input.tightness.startMbar - input.tightness.endMbar).toFixed(3)) : null;
  const all = judge({ figures: [], roomChecks: input.roomChecks.map((c) => ({ room: c.room, coPpm: c.coPpm, minutes: c.minutes })), tightnessDropMbar, resolved });
  // judge() also notes that no analyser reading was judged; that belongs to the appliances, not here.
  const items = all.items.filter((item) => INSTALLATION_METRICS.includes(item.metric));
  const overall = worstLevel(items.map((item) => item.level));
  const decidedBy = overall === 'clear' ? null : (items.find((item) => item.level === overall) ?? null);
  return { resolved, verdict: { overall, items, decidedBy, notJudged: [] }, tightnessDropMbar };
}

export const FINDING_LEVEL: Record<FindingSeverity, VerdictLevel> = { advice: 'clear', service: 'service', danger: 'danger' };

export type VisitVerdictInput = {
  appliances: ReadonlyArray<{
    applianceId: string;
    details: ApplianceDetails;
    spillage: CheckAnswer | null;
    readings: readonly RecordedReading[];
    notTestedReason: string | null;
  }>;
  roomChecks: InstallationInput['roomChecks'];
  tightness: InstallationInput['tightness'];
  findings: ReadonlyArray<{ applianceId: string | null; severity: FindingSeverity; description: string }>;
  makeSafe: ReadonlyArray<{ applianceId: string | null }>;
  limits: LimitContext;
  date: string;
};

/** Something that must be made safe: an appliance, or the installation (applianceId null). */
export type MakeSafeSubject = { applianceId: string | null; reasons: string[]; recorded: boolean };

export type VisitVerdicts = {
  overall: VerdictLevel;
  appliances: Record<string, ApplianceVerdict>;
  installation: InstallationVerdict | null;
  makeSafe: MakeSafeSubject[];
};

/**
 * Every verdict of a visit. An appliance marked not tested, with no readings, is left out; one that
 * was tested counts even if nothing could be judged ('unknown' is never read as clear). Findings
 * raise the level of their appliance (or the installation) to their severity.
 */
export function visitVerdicts(input: VisitVerdictInput): VisitVerdicts {
  const appliances: Record<string, ApplianceVerdict> = {};
  const levels: VerdictLevel[] = [];
  const subjects = new Map<string | null, string[]>();
  const flag = (applianceId: string | null, reason: string) => subjects.set(applianceId, [...(subjects.get(applianceId) ?? []), reason]);

  for (const a of input.appliances) {
    const untested = a.notTestedReason !== null && currentReadings(a.readings).length === 0;
    if (untested) continue;
    const result = applianceVerdict({ details: a.details, readings: a.readings, spillage: a.spillage, limits: input.limits, date: input.date });
    appliances[a.applianceId] = result;
    levels.push(result.verdict.overall);
    if (result.verdict.overall === 'danger') flag(a.applianceId, result.verdict.decidedBy?.explanation ?? 'A reading is at the danger level');
  }

  const installation = installationVerdict({
    roomChecks: input.roomChecks,
    tightness: input.tightness,
    fuels: input.appliances.map((a) => a.details.fuel),
    limits: input.limits,
    date: input.date,
  });
  if (installation) {
    levels.push(installation.verdict.overall);
    if (installation.verdict.overall === 'danger') flag(null, installation.verdict.decidedBy?.explanation ?? 'The installation is at the danger level');
  }

  const knownAppliances = new Set(input.appliances.map((a) => a.applianceId));
  for (const f of input.findings) {
    levels.push(FINDING_LEVEL[f.severity]);
    if (f.severity === 'danger') flag(f.applianceId !== null && knownAppliances.has(f.applianceId) ? f.applianceId : null, `Finding: ${f.description}`);
  }

  const recorded = new Set(input.makeSafe.map((m) => m.applianceId));
  const makeSafe = [...subjects.entries()].map(([applianceId, reasons]) => ({ applianceId, reasons, recorded: recorded.has(applianceId) }));
  // Nothing recorded at all is 'unknown', never clear.
  return { overall: worstLevel(levels), appliances, installation, makeSafe };
}

/** Calibration is overdue once the due date has passed (due today is still in date). */
export function calibrationOverdue(calibrationDue: string, date: string): boolean {
  return calibrationDue < date;
}

/** The calendar date (YYYY-MM-DD) of an instant in a time zone. */
export function localDate(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(iso));
}
