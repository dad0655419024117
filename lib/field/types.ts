// Shapes shared by the field app, its offline cache and the server: the visit bundle an engineer
// downloads, and the visit record the device builds up while recording. Plain JSON throughout.
import type { JurisdictionLevel, TestPoint, VerdictLevel } from '../limits/types';
import type { Hint, TrendReason } from '../insight';
import type {
  ApplianceDetails,
  FindingPayload,
  InspectionSave,
  MakeSafePayload,
  NoAccessPayload,
  PhotoPurpose,
  RoomCheckPayload,
  SignoffPayload,
  TempUnit,
  TightnessPayload,
} from '../validations/inspection';

/** The input lib/limits resolveLimits needs besides the appliance and date. */
export type LimitContext = { chain: JurisdictionLevel[]; orgDefault: JurisdictionLevel | null };

export type PastReading = { testPoint: TestPoint; coPpm: number; co2Pct: number | null; o2Pct: number | null; ratio: number | null };

/** One earlier inspection of an appliance, newest first in FieldAppliance.history. */
export type PastResult = {
  visitId: string;
  date: string;
  verdict: VerdictLevel | null;
  readings: PastReading[];
  findings: Array<{ severity: string; description: string }>;
};

/** One finished inspection on the ratio trend: its worst CO/CO2 ratio and the ratio limits in force on its date. */
export type TrendPoint = { date: string; verdict: VerdictLevel | null; ratio: number | null; serviceLimit: number | null; dangerLimit: number | null };

/**
 * The "getting worse" flag for an appliance, worked out by the server with lib/insight from every
 * finished inspection before this visit, so the phone shows it offline without the maths.
 */
export type FieldTrend = {
  worsening: boolean;
  reasons: TrendReason[];
  message: string;
  /** Oldest first; the latest few inspections only. */
  points: TrendPoint[];
  /** How many finished inspections the flag was worked out from (points may show fewer). */
  inspections: number;
  /** What to check, from common practice; never a verdict. */
  hints: Array<Pick<Hint, 'code' | 'title' | 'because' | 'checks'>>;
};

export type FieldAppliance = {
  id: string;
  details: ApplianceDetails;
  /** The office record's updatedAt, sent back with edits so an office change meanwhile is noticed. */
  updatedAt: string;
  history: PastResult[];
  /** Missing for appliances added on site and in bundles saved by an older version of the app. */
  trend?: FieldTrend;
};

export type FieldAnalyser = {
  id: string;
  serial: string;
  make: string;
  model: string;
  calibrationDue: string;
  coRangeMaxPpm: number;
  assignedToMe: boolean;
};

export type FieldVisitStatus = 'booked' | 'on_site' | 'submitted' | 'certified' | 'no_access' | 'cancelled';

export type FieldVisit = {
  id: string;
  status: FieldVisitStatus;
  kind: string;
  windowStart: string;
  windowEnd: string;
  notes: string | null;
  site: {
    id: string;
    reference: string;
    address: string;
    town: string;
    postcode: string;
    accessNotes: string | null;
    tenantName: string | null;
    tenantPhone: string | null;
    jurisdictionId: string;
    jurisdictionName: string;
  };
  appliances: FieldAppliance[];
};

export type FieldBundle = {
  visits: FieldVisit[];
  /** One per jurisdiction among the visits' sites; the device resolves limits from these offline. */
  limitContexts: Record<string, LimitContext>;
  analysers: FieldAnalyser[];
  timeZone: string;
  fetchedAt: string;
};

/** A reading as kept: temperatures in °C whatever unit was typed (tempUnit says which). */
export type RecordedReading = {
  id: string;
  testPoint: TestPoint;
  coPpm: number;
  co2Pct: number | null;
  o2Pct: number | null;
  flueTempC: number | null;
  airTempC: number | null;
  tempUnit: TempUnit;
  analyserId: string | null;
  takenAt: string;
  replacesId: string | null;
};

export type InspectionState = Omit<InspectionSave, 'applianceId'> & { readings: RecordedReading[] };

export type PhotoRef = {
  id: string;
  purpose: PhotoPurpose;
  applianceId: string | null;
  findingId: string | null;
  caption: string | null;
  takenAt: string | null;
  /** A small JPEG data URL kept on the device so the photo shows while it waits to upload. */
  thumbnail: string | null;
};

/** Everything recorded for one visit on this device. */
export type VisitRecord = {
  visitId: string;
  arrivedAt: string | null;
  addedAppliances: Array<{ id: string; details: ApplianceDetails }>;
  inspections: Record<string, InspectionState>;
  roomChecks: RoomCheckPayload[];
  tightness: TightnessPayload | null;
  findings: FindingPayload[];
  makeSafe: MakeSafePayload[];
  photos: PhotoRef[];
  signoff: SignoffPayload | null;
  noAccess: NoAccessPayload | null;
  submittedAt: string | null;
};

export function emptyVisitRecord(visitId: string): VisitRecord {
  return {
    visitId,
    arrivedAt: null,
    addedAppliances: [],
    inspections: {},
    roomChecks: [],
    tightness: null,
    findings: [],
    makeSafe: [],
    photos: [],
    signoff: null,
    noAccess: null,
    submittedAt: null,
  };
}
