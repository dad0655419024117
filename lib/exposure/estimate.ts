// The exposure estimate for one room check: COHb after the measured time and after 1 h and 8 h at
// the measured level, for each activity preset, beside the ambient limits it exceeds. An estimate
// for a typical adult, never a diagnosis of anyone in the room.
import { findResolved, resolveLimits, trips, type Comparator, type JurisdictionLevel, type ResolvedLimits } from '../limits';
import { BASELINE_COHB_PCT, CFK_PRESETS, cohbAfter, cfkConstants, steadyStateCohbPct, type ActivityPreset } from './cfk';
import { OTHER_LIMITS, WHO_LIMITS, symptomBandFor, type AmbientLimit, type SymptomBand } from './ambient';

export type JurisdictionRoomLimit = {
  jurisdictionName: string;
  serviceAtPpm: number | null;
  dangerAtPpm: number | null;
  comparator: Comparator;
  source: string;
};

export type ExposurePoint = { minutes: number; cohbPct: number; band: SymptomBand };

export type ActivityEstimate = {
  activity: ActivityPreset;
  source: string;
  /** Null when the room check has no duration. */
  atMeasured: ExposurePoint | null;
  after1h: ExposurePoint;
  after8h: ExposurePoint;
  steadyStatePct: number;
  timeConstantMin: number;
};

export type LimitComparison = AmbientLimit & { exceeded: boolean };

export type ExposureEstimate = {
  coPpm: number;
  measuredMinutes: number | null;
  startCohbPct: number;
  estimates: ActivityEstimate[];
  limits: LimitComparison[];
  jurisdiction: (JurisdictionRoomLimit & { level: 'clear' | 'service' | 'danger' }) | null;
  /** The usual advice for high room CO applies (over the WHO 15-minute figure or the jurisdiction's service level). */
  high: boolean;
  disclaimer: string;
};

export const EXPOSURE_DISCLAIMER =
  'An estimate for a typical healthy adult breathing this level without a break, from the Coburn–Forster–Kane equation. It is not a diagnosis: children, older people, pregnant women and people with heart or lung disease can be harmed at lower levels. Anyone with symptoms needs medical help.';

/** The room CO rule in force for the site's jurisdiction, from lib/limits' resolution. */
export function jurisdictionRoomLimit(resolved: ResolvedLimits): JurisdictionRoomLimit | null {
  const decided = findResolved(resolved, 'room_co_ppm', null)?.decided;
  if (!decided) return null;
  return { jurisdictionName: decided.jurisdictionName, serviceAtPpm: decided.serviceAt, dangerAtPpm: decided.dangerAt, comparator: decided.comparator, source: decided.source };
}

/**
 * The room CO rule in force on a date from a site's limit context (as cached by the field app).
 * Room CO is judged for the installation, not one appliance, so the appliance key is neutral:
 * a room rule scoped to a category would not be picked here.
 */
export function jurisdictionRoomLimitOn(input: { chain: JurisdictionLevel[]; orgDefault: JurisdictionLevel | null; date: string }): JurisdictionRoomLimit | null {
  return jurisdictionRoomLimit(resolveLimits({ chain: input.chain, orgDefault: input.orgDefault, appliance: { category: 'other', fuel: 'natural-gas' }, date: input.date }));
}

function point(input: { coPpm: number; minutes: number; startCohbPct: number; activity: ActivityPreset }): ExposurePoint {
  const cohbPct = cohbAfter({ coPpm: input.coPpm, minutes: input.minutes, startCohbPct: input.startCohbPct, parameters: CFK_PRESETS[input.activity].parameters });
  return { minutes: input.minutes, cohbPct, band: symptomBandFor(cohbPct) };
}

// The rule's own comparator decides "at the figure": BS 7967's is "10 ppm or more", NREL's "above 35".
function roomLevel(coPpm: number, limit: JurisdictionRoomLimit): 'clear' | 'service' | 'danger' {
  if (limit.dangerAtPpm !== null && trips(coPpm, limit.dangerAtPpm, limit.comparator)) return 'danger';
  if (limit.serviceAtPpm !== null && trips(coPpm, limit.serviceAtPpm, limit.comparator)) return 'service';
  return 'clear';
}

export function estimateExposure(input: {
  coPpm: number;
  minutes: number | null;
  jurisdiction?: JurisdictionRoomLimit | null;
  startCohbPct?: number;
}): ExposureEstimate {
  const startCohbPct = input.startCohbPct ?? BASELINE_COHB_PCT;
  const coPpm = input.coPpm;
  const measured = input.minutes !== null && input.minutes > 0 ? input.minutes : null;
  const estimates: ActivityEstimate[] = (['resting', 'light_work'] as const).map((activity) => {
    const parameters = CFK_PRESETS[activity].parameters;
    return {
      activity,
      source: CFK_PRESETS[activity].source,
      atMeasured: measured === null ? null : point({ coPpm, minutes: measured, startCohbPct, activity }),
      after1h: point({ coPpm, minutes: 60, startCohbPct, activity }),
      after8h: point({ coPpm, minutes: 480, startCohbPct, activity }),
      steadyStatePct: steadyStateCohbPct({ coPpm, parameters }),
      timeConstantMin: cfkConstants(parameters).timeConstantMin,
    };
  });
  const limits = [...WHO_LIMITS, ...OTHER_LIMITS].map((l) => ({ ...l, exceeded: coPpm > l.ppm }));
  const jurisdiction = input.jurisdiction ? { ...input.jurisdiction, level: roomLevel(coPpm, input.jurisdiction) } : null;
  const whoShortTerm = WHO_LIMITS[0]!.ppm;
  return {
    coPpm,
    measuredMinutes: measured,
    startCohbPct,
    estimates,
    limits,
    jurisdiction,
    high: coPpm > whoShortTerm || (jurisdiction !== null && jurisdiction.level !== 'clear'),
    disclaimer: EXPOSURE_DISCLAIMER,
  };
}
