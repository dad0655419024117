// Applies a mutation to the device's visit record. The same mutation then waits in the outbox for
// the server, so what the engineer sees is exactly what will be sent.
import { fToC } from '../combustion';
import type { ApplianceDetails, ReadingValues } from '../validations/inspection';
import type { Mutation } from '../validations/sync';
import type { InspectionState, PhotoRef, RecordedReading, VisitRecord } from './types';

export function defaultInspection(details: ApplianceDetails, baseUpdatedAt: string | null): InspectionState {
  return {
    details,
    detailsConfirmed: false,
    baseUpdatedAt,
    checklist: { visualCondition: null, flueTermination: null, ventilation: null, operatingPressure: null, safetyDevices: null, coAlarm: null },
    spillage: null,
    operatingPressureMbar: null,
    meterTest: null,
    analyserId: null,
    analyserOverrideReason: null,
    notes: null,
    notTestedReason: null,
    readings: [],
  };
}

/** Temperatures to °C; the values were range-checked for their unit by readingValuesSchema. */
export function canonicalReading(values: ReadingValues): Pick<RecordedReading, 'coPpm' | 'co2Pct' | 'o2Pct' | 'flueTempC' | 'airTempC' | 'tempUnit'> {
  const toC = (v: number | null) => (v === null ? null : values.tempUnit === 'F' ? fToC(v) : v);
  return { coPpm: values.coPpm, co2Pct: values.co2Pct, o2Pct: values.o2Pct, flueTempC: toC(values.flueTemp), airTempC: toC(values.airTemp), tempUnit: values.tempUnit };
}

export type ApplianceLookup = (applianceId: string) => { details: ApplianceDetails; updatedAt: string | null } | null;

function upsertBy<T>(list: readonly T[], item: T, same: (a: T) => boolean): T[] {
  const i = list.findIndex(same);
  if (i === -1) return [...list, item];
  const next = [...list];
  next[i] = item;
  return next;
}

function inspectionFor(record: VisitRecord, applianceId: string, lookup: ApplianceLookup): InspectionState | null {
  const existing = record.inspections[applianceId];
  if (existing) return existing;
  const added = record.addedAppliances.find((a) => a.id === applianceId);
  if (added) return defaultInspection(added.details, null);
  const known = lookup(applianceId);
  return known ? defaultInspection(known.details, known.updatedAt) : null;
}

/** The record after the mutation. Pure: returns a new object, never edits the one given. */
export function applyMutation(record: VisitRecord, mutation: Mutation, lookup: ApplianceLookup): VisitRecord {
  const next: VisitRecord = { ...record, arrivedAt: record.arrivedAt ?? (mutation.kind === 'visit.noAccess' ? null : mutation.at) };
  switch (mutation.kind) {
    case 'visit.arrive':
      return { ...next, arrivedAt: record.arrivedAt ?? mutation.payload.arrivedAt };
    case 'appliance.add':
      return { ...next, addedAppliances: upsertBy(record.addedAppliances, { id: mutation.payload.applianceId, details: mutation.payload.details }, (a) => a.id === mutation.payload.applianceId) };
    case 'inspection.save': {
      const { applianceId, ...rest } = mutation.payload;
      const current = inspectionFor(record, applianceId, lookup);
      return { ...next, inspections: { ...record.inspections, [applianceId]: { ...rest, readings: current?.readings ?? [] } } };
    }
    case 'reading.record': {
      const p = mutation.payload;
      const current = inspectionFor(record, p.applianceId, lookup);
      if (!current) return next;
      const reading: RecordedReading = { id: p.readingId, testPoint: p.testPoint, ...canonicalReading(p.values), analyserId: p.analyserId, takenAt: p.takenAt, replacesId: p.replacesId };
      return { ...next, inspections: { ...record.inspections, [p.applianceId]: { ...current, readings: upsertBy(current.readings, reading, (r) => r.id === reading.id) } } };
    }
    case 'roomCheck.save':
      return { ...next, roomChecks: upsertBy(record.roomChecks, mutation.payload, (c) => c.roomCheckId === mutation.payload.roomCheckId) };
    case 'roomCheck.remove':
      return { ...next, roomChecks: record.roomChecks.filter((c) => c.roomCheckId !== mutation.payload.roomCheckId) };
    case 'tightness.save':
      return { ...next, tightness: mutation.payload };
    case 'finding.save':
      return { ...next, findings: upsertBy(record.findings, mutation.payload, (f) => f.findingId === mutation.payload.findingId) };
    case 'finding.remove':
      return { ...next, findings: record.findings.filter((f) => f.findingId !== mutation.payload.findingId) };
    case 'makeSafe.save':
      return { ...next, makeSafe: upsertBy(record.makeSafe, mutation.payload, (m) => m.makeSafeId === mutation.payload.makeSafeId) };
    case 'signoff.save':
      return { ...next, signoff: mutation.payload };
    case 'visit.noAccess':
      return { ...next, noAccess: mutation.payload, submittedAt: mutation.at };
    case 'visit.submit':
      return { ...next, submittedAt: mutation.at };
  }
}

export function addPhoto(record: VisitRecord, photo: PhotoRef): VisitRecord {
  return { ...record, photos: upsertBy(record.photos, photo, (p) => p.id === photo.id) };
}

/** The inspection.save payload for an inspection state (everything but its readings). */
export function inspectionPayload(applianceId: string, state: InspectionState) {
  const { readings: _readings, ...rest } = state;
  void _readings;
  return { applianceId, ...rest };
}
