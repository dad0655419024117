import 'server-only';
// Inspections and everything recorded with them (readings, room checks, tightness test, findings,
// make-safe records, sign-off): what the field app downloads for offline use, what the server
// recomputes the verdict from, and the read-only report the office reviews.
import type { Knex } from 'knex';
import { db } from './knex';
import { toBool, toDateOnly, toIso, toNum } from './rows';
import type { ApplianceCategory, FuelId, TestPoint, Verdict, VerdictLevel, ResolvedLimits } from '@/lib/limits';
import type { ApplianceDetails, Checklist, CheckAnswer, FindingAction, FindingSeverity, FlueType, MeterTest, TempUnit } from '@/lib/validations/inspection';
import { currentReadings, localDate, type FieldAnalyser, type FieldAppliance, type FieldBundle, type FieldVisit, type FieldVisitStatus, type LimitContext, type PastResult, type RecordedReading } from '@/lib/field';
import { loadLimitContext } from './code-profiles';

type Row = Record<string, unknown>;

export function applianceDetailsFromRow(r: Row): ApplianceDetails {
  return {
    category: r.category as ApplianceCategory,
    fuel: r.fuel as FuelId,
    flueType: r.flue_type as FlueType,
    location: String(r.location),
    make: (r.make as string | null) ?? null,
    model: (r.model as string | null) ?? null,
    serial: (r.serial as string | null) ?? null,
    ratedInputKw: toNum(r.rated_input_kw),
    mfrRatioMax: toNum(r.mfr_ratio_max),
    mfrCoAirFreeMaxPpm: toNum(r.mfr_co_air_free_max_ppm),
    mfrCoMaxPpm: toNum(r.mfr_co_max_ppm),
  };
}

export function applianceColumns(d: ApplianceDetails): Row {
  return {
    category: d.category,
    fuel: d.fuel,
    flue_type: d.flueType,
    location: d.location,
    make: d.make,
    model: d.model,
    serial: d.serial,
    rated_input_kw: d.ratedInputKw,
    mfr_ratio_max: d.mfrRatioMax,
    mfr_co_air_free_max_ppm: d.mfrCoAirFreeMaxPpm,
    mfr_co_max_ppm: d.mfrCoMaxPpm,
  };
}

export function readingFromRow(r: Row): RecordedReading & { recordedBy: string | null } {
  return {
    id: String(r.id),
    testPoint: r.test_point as TestPoint,
    coPpm: Number(r.co_ppm),
    co2Pct: toNum(r.co2_pct),
    o2Pct: toNum(r.o2_pct),
    flueTempC: toNum(r.flue_temp_c),
    airTempC: toNum(r.air_temp_c),
    tempUnit: (r.temp_unit as TempUnit) ?? 'C',
    analyserId: (r.analyser_id as string | null) ?? null,
    takenAt: toIso(r.taken_at) ?? '',
    replacesId: (r.replaces_id as string | null) ?? null,
    recordedBy: (r.recorded_by as string | null) ?? null,
  };
}

function parseJson<T>(value: unknown, fallback: T): T {
  if (typeof value !== 'string' || value === '') return fallback;
  try {
    return JSON.parse(value) as T;
  } catch {
    return fallback;
  }
}

/** A visit assigned to this engineer in this organisation, or null (callers answer 404 either way). */
export async function getEngineerVisitRow(knex: Knex, input: { organisationId: string; engineerId: string; visitId: string }): Promise<Row | null> {
  const row = await knex('visits').where({ id: input.visitId, organisation_id: input.organisationId, engineer_id: input.engineerId }).first();
  return (row as Row | undefined) ?? null;
}

const HISTORY_DEPTH = 3;

/** The last few submitted or certified inspections of each appliance, newest first. */
async function applianceHistory(knex: Knex, applianceIds: string[], excludeVisitId: string | null): Promise<Map<string, PastResult[]>> {
  const byAppliance = new Map<string, PastResult[]>();
  if (applianceIds.length === 0) return byAppliance;
  const rows: Row[] = await knex('inspections as i')
    .join('visits as v', 'v.id', 'i.visit_id')
    .whereIn('i.appliance_id', applianceIds)
    .whereIn('v.status', ['submitted', 'certified'])
    .modify((q) => {
      if (excludeVisitId) q.whereNot('v.id', excludeVisitId);
    })
    .select('i.id', 'i.appliance_id', 'i.verdict_of_record', 'v.id as visit_id', 'v.window_start', 'v.submitted_at')
    .orderBy('v.window_start', 'desc');
  const kept = rows.filter((r) => {
    const list = byAppliance.get(String(r.appliance_id)) ?? [];
    if (list.length >= HISTORY_DEPTH) return false;
    list.push({ visitId: String(r.visit_id), date: toDateOnly(r.submitted_at ?? r.window_start) ?? '', verdict: (r.verdict_of_record as VerdictLevel | null) ?? null, readings: [], findings: [] });
    byAppliance.set(String(r.appliance_id), list);
    return true;
  });
  const inspectionIds = kept.map((r) => String(r.id));
  if (inspectionIds.length === 0) return byAppliance;
  const readingRows: Row[] = await knex('readings').whereIn('inspection_id', inspectionIds).orderBy('taken_at');
  const findingRows: Row[] = await knex('findings as f')
    .join('inspections as i', function joinOn() {
      this.on('i.visit_id', '=', 'f.visit_id').andOn('i.appliance_id', '=', 'f.appliance_id');
    })
    .whereIn('i.id', inspectionIds)
    .whereNull('f.deleted_at')
    .select('i.id as inspection_id', 'f.severity', 'f.description');
  for (const r of kept) {
    const past = byAppliance.get(String(r.appliance_id))!.find((p) => p.visitId === String(r.visit_id))!;
    const mine = readingRows.filter((x) => x.inspection_id === r.id).map(readingFromRow);
    past.readings = currentReadings(mine).map((x) => ({
      testPoint: x.testPoint,
      coPpm: x.coPpm,
      co2Pct: x.co2Pct,
      o2Pct: x.o2Pct,
      ratio: x.co2Pct ? x.coPpm / 10000 / x.co2Pct : null,
    }));
    past.findings = findingRows.filter((f) => f.inspection_id === r.id).map((f) => ({ severity: String(f.severity), description: String(f.description) }));
  }
  return byAppliance;
}

async function fieldAppliances(knex: Knex, siteIds: string[], organisationId: string): Promise<Map<string, Row[]>> {
  const rows: Row[] = siteIds.length
    ? await knex('appliances').where({ organisation_id: organisationId, active: true }).whereIn('site_id', siteIds).orderBy('created_at').orderBy('id')
    : [];
  const bySite = new Map<string, Row[]>();
  for (const r of rows) bySite.set(String(r.site_id), [...(bySite.get(String(r.site_id)) ?? []), r]);
  return bySite;
}

const FIELD_VISIT_COLUMNS = [
  'v.id', 'v.status', 'v.kind', 'v.window_start', 'v.window_end', 'v.notes', 'v.site_id',
  's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode', 's.access_notes', 's.tenant_name', 's.tenant_phone', 's.jurisdiction_id',
  'j.name as jurisdiction_name',
];

async function toFieldVisits(knex: Knex, organisationId: string, rows: Row[]): Promise<FieldVisit[]> {
  const bySite = await fieldAppliances(knex, [...new Set(rows.map((r) => String(r.site_id)))], organisationId);
  const visits: FieldVisit[] = [];
  for (const r of rows) {
    const applianceRows = bySite.get(String(r.site_id)) ?? [];
    const history = await applianceHistory(knex, applianceRows.map((a) => String(a.id)), String(r.id));
    const appliances: FieldAppliance[] = applianceRows.map((a) => ({
      id: String(a.id),
      details: applianceDetailsFromRow(a),
      updatedAt: toIso(a.updated_at) ?? '',
      history: history.get(String(a.id)) ?? [],
    }));
    visits.push({
      id: String(r.id),
      status: r.status as FieldVisitStatus,
      kind: String(r.kind),
      windowStart: toIso(r.window_start) ?? '',
      windowEnd: toIso(r.window_end) ?? '',
      notes: (r.notes as string | null) ?? null,
      site: {
        id: String(r.site_id),
        reference: String(r.reference),
        address: [r.address_line1, r.address_line2].filter(Boolean).join(', '),
        town: String(r.town),
        postcode: String(r.postcode),
        accessNotes: (r.access_notes as string | null) ?? null,
        tenantName: (r.tenant_name as string | null) ?? null,
        tenantPhone: (r.tenant_phone as string | null) ?? null,
        jurisdictionId: String(r.jurisdiction_id),
        jurisdictionName: String(r.jurisdiction_name ?? ''),
      },
      appliances,
    });
  }
  return visits;
}

function fieldVisitQuery(knex: Knex, organisationId: string, engineerId: string) {
  return knex('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .leftJoin('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .where({ 'v.organisation_id': organisationId, 'v.engineer_id': engineerId })
    .select(FIELD_VISIT_COLUMNS);
}

/**
 * An engineer's work for the device to keep offline: visits from `fromIso` to `toIso` that are not
 * cancelled, plus any earlier visit still open (arrived but not submitted).
 */
export async function listFieldVisits(input: { organisationId: string; engineerId: string; fromIso: string; toIso: string }): Promise<FieldVisit[]> {
  const knex = db();
  const rows: Row[] = await fieldVisitQuery(knex, input.organisationId, input.engineerId)
    .andWhere((q) =>
      q
        .where((w) => w.where('v.window_start', '>=', input.fromIso).andWhere('v.window_start', '<', input.toIso).whereNot('v.status', 'cancelled'))
        .orWhere((w) => w.where('v.window_start', '<', input.fromIso).whereIn('v.status', ['booked', 'on_site'])),
    )
    .orderBy('v.window_start', 'asc');
  return toFieldVisits(knex, input.organisationId, rows);
}

export async function getFieldVisit(input: { organisationId: string; engineerId: string; visitId: string }): Promise<FieldVisit | null> {
  const knex = db();
  const rows: Row[] = await fieldVisitQuery(knex, input.organisationId, input.engineerId).andWhere('v.id', input.visitId);
  const [visit] = await toFieldVisits(knex, input.organisationId, rows);
  return visit ?? null;
}

/** The organisation's analyser register as the field app needs it (active analysers only). */
export async function listFieldAnalysers(input: { organisationId: string; engineerId: string }): Promise<FieldAnalyser[]> {
  const rows: Row[] = await db()('analysers').where({ organisation_id: input.organisationId, active: true }).orderBy('serial');
  return rows.map((r) => ({
    id: String(r.id),
    serial: String(r.serial),
    make: String(r.make),
    model: String(r.model),
    calibrationDue: toDateOnly(r.calibration_due) ?? '',
    coRangeMaxPpm: Number(r.co_range_max_ppm),
    assignedToMe: r.assigned_to === input.engineerId,
  }));
}

export async function getOrganisationTimeZone(knex: Knex, organisationId: string): Promise<string> {
  const row = (await knex('organisations').where({ id: organisationId }).first('time_zone')) as Row | undefined;
  return String(row?.time_zone ?? 'UTC');
}

// ---------------------------------------------------------------------------------------------
// Everything recorded for one visit, as stored. Used to recompute the verdict on submit and to
// show the office what was recorded.

export type StoredInspection = {
  id: string;
  applianceId: string;
  details: ApplianceDetails;
  detailsConfirmed: boolean;
  checklist: Checklist;
  spillage: CheckAnswer | null;
  operatingPressureMbar: number | null;
  meterTest: MeterTest | null;
  heatInputGrossKw: number | null;
  heatInputNetKw: number | null;
  analyserId: string | null;
  analyserOverrideReason: string | null;
  notes: string | null;
  notTestedReason: string | null;
  clientVerdict: VerdictLevel | null;
  verdictOfRecord: VerdictLevel | null;
  verdict: Verdict | null;
  limits: ResolvedLimits | null;
  verdictAt: string | null;
  /** Every reading, superseded ones included (lib/field's currentReadings picks the live ones). */
  readings: Array<RecordedReading & { recordedBy: string | null }>;
};

export type StoredRoomCheck = { id: string; room: string; coPpm: number; minutes: number | null; takenAt: string };
export type StoredTightness = { id: string; startMbar: number; endMbar: number; durationMin: number; takenAt: string };
export type StoredFinding = { id: string; applianceId: string | null; severity: FindingSeverity; description: string; action: FindingAction; recordedAt: string };
export type StoredMakeSafe = {
  id: string;
  applianceId: string | null;
  madeSafeBy: 'turned_off' | 'isolated';
  occupantWarned: boolean;
  consent: 'given' | 'refused';
  occupantName: string | null;
  refusalNote: string | null;
  warningNoticeLeft: boolean;
  notes: string | null;
  recordedAt: string;
};
export type StoredSignoff = {
  occupantName: string | null;
  signaturePhotoId: string | null;
  noSignatureReason: string | null;
  signedAt: string | null;
  declarationText: string;
  engineerId: string;
  declaredAt: string;
};

export type VisitRecords = {
  inspections: StoredInspection[];
  roomChecks: StoredRoomCheck[];
  tightness: StoredTightness | null;
  findings: StoredFinding[];
  makeSafe: StoredMakeSafe[];
  signoff: StoredSignoff | null;
};

export async function loadVisitRecords(knex: Knex, visitId: string): Promise<VisitRecords> {
  const inspectionRows: Row[] = await knex('inspections').where({ visit_id: visitId }).orderBy('created_at').orderBy('id');
  const readingRows: Row[] = inspectionRows.length
    ? await knex('readings').whereIn('inspection_id', inspectionRows.map((r) => String(r.id))).orderBy('taken_at').orderBy('created_at')
    : [];
  const inspections: StoredInspection[] = inspectionRows.map((r) => ({
    id: String(r.id),
    applianceId: String(r.appliance_id),
    details: parseJson<ApplianceDetails>(r.appliance_json, {} as ApplianceDetails),
    detailsConfirmed: toBool(r.details_confirmed),
    checklist: parseJson<Checklist>(r.checklist_json, {} as Checklist),
    spillage: (r.spillage as CheckAnswer | null) ?? null,
    operatingPressureMbar: toNum(r.operating_pressure_mbar),
    meterTest: parseJson<MeterTest | null>(r.meter_test_json, null),
    heatInputGrossKw: toNum(r.heat_input_gross_kw),
    heatInputNetKw: toNum(r.heat_input_net_kw),
    analyserId: (r.analyser_id as string | null) ?? null,
    analyserOverrideReason: (r.analyser_override_reason as string | null) ?? null,
    notes: (r.notes as string | null) ?? null,
    notTestedReason: (r.not_tested_reason as string | null) ?? null,
    clientVerdict: (r.client_verdict as VerdictLevel | null) ?? null,
    verdictOfRecord: (r.verdict_of_record as VerdictLevel | null) ?? null,
    verdict: parseJson<Verdict | null>(r.verdict_json, null),
    limits: parseJson<ResolvedLimits | null>(r.limits_json, null),
    verdictAt: toIso(r.verdict_at),
    readings: readingRows.filter((x) => x.inspection_id === r.id).map(readingFromRow),
  }));
  const roomChecks: StoredRoomCheck[] = (await knex('room_checks').where({ visit_id: visitId }).whereNull('deleted_at').orderBy('taken_at')).map((r: Row) => ({
    id: String(r.id),
    room: String(r.room),
    coPpm: Number(r.co_ppm),
    minutes: toNum(r.minutes),
    takenAt: toIso(r.taken_at) ?? '',
  }));
  const tightnessRow = (await knex('tightness_tests').where({ visit_id: visitId }).whereNull('deleted_at').orderBy('taken_at', 'desc').first()) as Row | undefined;
  const findings: StoredFinding[] = (await knex('findings').where({ visit_id: visitId }).whereNull('deleted_at').orderBy('recorded_at')).map((r: Row) => ({
    id: String(r.id),
    applianceId: (r.appliance_id as string | null) ?? null,
    severity: r.severity as FindingSeverity,
    description: String(r.description),
    action: r.action as FindingAction,
    recordedAt: toIso(r.recorded_at) ?? '',
  }));
  const makeSafe: StoredMakeSafe[] = (await knex('make_safe_records').where({ visit_id: visitId }).orderBy('recorded_at')).map((r: Row) => ({
    id: String(r.id),
    applianceId: (r.appliance_id as string | null) ?? null,
    madeSafeBy: r.made_safe_by as 'turned_off' | 'isolated',
    occupantWarned: toBool(r.occupant_warned),
    consent: r.consent as 'given' | 'refused',
    occupantName: (r.occupant_name as string | null) ?? null,
    refusalNote: (r.refusal_note as string | null) ?? null,
    warningNoticeLeft: toBool(r.warning_notice_left),
    notes: (r.notes as string | null) ?? null,
    recordedAt: toIso(r.recorded_at) ?? '',
  }));
  const signoffRow = (await knex('visit_signoffs').where({ visit_id: visitId }).first()) as Row | undefined;
  return {
    inspections,
    roomChecks,
    tightness: tightnessRow
      ? { id: String(tightnessRow.id), startMbar: Number(tightnessRow.start_mbar), endMbar: Number(tightnessRow.end_mbar), durationMin: Number(tightnessRow.duration_min), takenAt: toIso(tightnessRow.taken_at) ?? '' }
      : null,
    findings,
    makeSafe,
    signoff: signoffRow
      ? {
          occupantName: (signoffRow.occupant_name as string | null) ?? null,
          signaturePhotoId: (signoffRow.signature_photo_id as string | null) ?? null,
          noSignatureReason: (signoffRow.no_signature_reason as string | null) ?? null,
          signedAt: toIso(signoffRow.signed_at),
          declarationText: String(signoffRow.declaration_text),
          engineerId: String(signoffRow.engineer_id),
          declaredAt: toIso(signoffRow.declared_at) ?? '',
        }
      : null,
  };
}

// ---------------------------------------------------------------------------------------------
// The office's read-only view of a visit.

export type VisitReport = {
  visit: {
    id: string;
    status: FieldVisitStatus;
    kind: string;
    windowStart: string;
    arrivedAt: string | null;
    submittedAt: string | null;
    noAccessAt: string | null;
    noAccessNote: string | null;
    overallVerdict: VerdictLevel | null;
    /** Room CO and the tightness test, judged once for the installation on submit. */
    installationVerdict: Verdict | null;
    engineerName: string | null;
    date: string;
  };
  site: { id: string; reference: string; address: string; town: string; postcode: string; jurisdictionName: string };
  appliances: Array<{ id: string; details: ApplianceDetails }>;
  records: VisitRecords;
  analysers: Array<{ id: string; serial: string; make: string; model: string; calibrationDue: string }>;
  photos: Array<{ id: string; purpose: string; applianceId: string | null; findingId: string | null; caption: string | null; width: number; height: number }>;
  conflicts: Array<{ id: string; kind: string; applianceId: string | null; summary: string; serverJson: string; clientJson: string; createdAt: string; resolvedAt: string | null }>;
  discrepancies: Array<{ subject: string; applianceId: string | null; clientVerdict: string; serverVerdict: string; createdAt: string }>;
};

export async function getVisitReport(input: { organisationId: string; visitId: string }): Promise<VisitReport | null> {
  const knex = db();
  const v = (await knex('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .leftJoin('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .where({ 'v.id': input.visitId, 'v.organisation_id': input.organisationId })
    .select('v.*', 's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode', 'j.name as jurisdiction_name', 'u.name as engineer_name')
    .first()) as Row | undefined;
  if (!v) return null;
  const timeZone = await getOrganisationTimeZone(knex, input.organisationId);
  const records = await loadVisitRecords(knex, input.visitId);
  const applianceIds = records.inspections.map((i) => i.applianceId);
  const applianceRows: Row[] = await knex('appliances').where({ organisation_id: input.organisationId }).andWhere((q) => q.where('site_id', String(v.site_id)).orWhereIn('id', applianceIds));
  const analyserIds = [...new Set(records.inspections.flatMap((i) => [i.analyserId, ...i.readings.map((r) => r.analyserId)]).filter((x): x is string => x !== null))];
  const analyserRows: Row[] = analyserIds.length ? await knex('analysers').whereIn('id', analyserIds).andWhere({ organisation_id: input.organisationId }) : [];
  const photoRows: Row[] = await knex('photos').where({ visit_id: input.visitId, organisation_id: input.organisationId }).orderBy('created_at');
  const conflictRows: Row[] = await knex('sync_conflicts').where({ visit_id: input.visitId, organisation_id: input.organisationId }).orderBy('created_at');
  const discrepancyRows: Row[] = await knex('verdict_discrepancies').where({ visit_id: input.visitId, organisation_id: input.organisationId }).orderBy('created_at');
  const arrived = toIso(v.arrived_at);
  return {
    visit: {
      id: String(v.id),
      status: v.status as FieldVisitStatus,
      kind: String(v.kind),
      windowStart: toIso(v.window_start) ?? '',
      arrivedAt: arrived,
      submittedAt: toIso(v.submitted_at),
      noAccessAt: toIso(v.no_access_at),
      noAccessNote: (v.no_access_note as string | null) ?? null,
      overallVerdict: (v.overall_verdict as VerdictLevel | null) ?? null,
      installationVerdict: parseJson<Verdict | null>(v.installation_verdict_json, null),
      engineerName: (v.engineer_name as string | null) ?? null,
      date: localDate(arrived ?? toIso(v.window_start) ?? new Date().toISOString(), timeZone),
    },
    site: {
      id: String(v.site_id),
      reference: String(v.reference),
      address: [v.address_line1, v.address_line2].filter(Boolean).join(', '),
      town: String(v.town),
      postcode: String(v.postcode),
      jurisdictionName: String(v.jurisdiction_name ?? ''),
    },
    appliances: applianceRows.map((a) => ({ id: String(a.id), details: applianceDetailsFromRow(a) })),
    records,
    analysers: analyserRows.map((a) => ({ id: String(a.id), serial: String(a.serial), make: String(a.make), model: String(a.model), calibrationDue: toDateOnly(a.calibration_due) ?? '' })),
    photos: photoRows
      .filter((p) => p.purpose !== 'signature')
      .map((p) => ({
        id: String(p.id),
        purpose: String(p.purpose),
        applianceId: (p.appliance_id as string | null) ?? null,
        findingId: (p.finding_id as string | null) ?? null,
        caption: (p.caption as string | null) ?? null,
        width: Number(p.width),
        height: Number(p.height),
      })),
    conflicts: conflictRows.map((c) => ({
      id: String(c.id),
      kind: String(c.kind),
      applianceId: (c.appliance_id as string | null) ?? null,
      summary: String(c.summary),
      serverJson: String(c.server_json),
      clientJson: String(c.client_json),
      createdAt: toIso(c.created_at) ?? '',
      resolvedAt: toIso(c.resolved_at),
    })),
    discrepancies: discrepancyRows.map((d) => ({
      subject: String(d.subject),
      applianceId: (d.appliance_id as string | null) ?? null,
      clientVerdict: String(d.client_verdict),
      serverVerdict: String(d.server_verdict),
      createdAt: toIso(d.created_at) ?? '',
    })),
  };
}

/** What the device keeps for offline work: the visits, each site's limits, the analyser register. */
export async function getFieldBundle(input: { organisationId: string; engineerId: string; fromIso: string; toIso: string; visitId?: string }): Promise<FieldBundle | null> {
  const visits = input.visitId
    ? await getFieldVisit({ organisationId: input.organisationId, engineerId: input.engineerId, visitId: input.visitId }).then((v) => (v ? [v] : null))
    : await listFieldVisits(input);
  if (!visits) return null;
  const limitContexts: Record<string, LimitContext> = {};
  for (const jurisdictionId of new Set(visits.map((v) => v.site.jurisdictionId))) {
    limitContexts[jurisdictionId] = await loadLimitContext({ organisationId: input.organisationId, jurisdictionId });
  }
  return {
    visits,
    limitContexts,
    analysers: await listFieldAnalysers({ organisationId: input.organisationId, engineerId: input.engineerId }),
    timeZone: await getOrganisationTimeZone(db(), input.organisationId),
    fetchedAt: new Date().toISOString(),
  };
}
