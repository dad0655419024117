import 'server-only';
// Applies the field app's offline mutations. Each one runs in its own transaction together with
// the row that records its id in sync_mutations, so it is applied exactly once: a resent mutation
// finds its id and is answered "duplicate". One bad mutation is rejected on its own; the rest of the
// batch still applies. Nothing here overwrites a reading: corrections and conflicts add rows.
import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import { db } from './knex';
import { takeWriteLock } from './config';
import { nowIso, toDateOnly, toIso } from './rows';
import { applianceColumns, applianceDetailsFromRow, getOrganisationTimeZone, loadVisitRecords } from './inspections';
import { loadLimitContextForSite } from './code-profiles';
import { AppError, fieldsFromIssues } from '@/lib/errors';
import { newId } from '@/lib/ids';
import { heatInputKw, CombustionInputError } from '@/lib/combustion';
import { analyseReading, calibrationOverdue, canonicalReading, currentReadings, localDate, submitBlockers, visitVerdicts, type LimitContext } from '@/lib/field';
import { mutationSchema, type Mutation, type MutationOf, type MutationResult } from '@/lib/validations/sync';
import type { ApplianceDetails } from '@/lib/validations/inspection';
import { cleanImage, type CleanImage } from '@/lib/storage/images';
import { fileStore } from '@/lib/storage';

type Row = Record<string, unknown>;
export type SyncUser = { id: string; organisationId: string };

/** Work done before the transaction: slow or reading through the shared pool (SQLite has one connection). */
type Prepared = { limits?: LimitContext; timeZone?: string; signature?: { photoId: string; key: string; image: CleanImage } };

type Ctx<K extends Mutation['kind'] = Mutation['kind']> = {
  trx: Knex.Transaction;
  user: SyncUser;
  visit: Row;
  mutation: MutationOf<K>;
  prepared: Prepared;
  now: string;
};

/** What the helpers need from any mutation's context. */
type Base = { trx: Knex.Transaction; user: SyncUser; visit: Row; now: string; mutation: { id: string } };

type Outcome = { conflict?: boolean; warnings?: string[] };

const OPEN_STATUSES = ['booked', 'on_site'];

function rejected(id: string, err: AppError): MutationResult {
  return { id, status: 'rejected', httpStatus: err.status, code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) };
}

/** Field names relative to the payload ("values.o2Pct"), as the form that made it names them. */
function payloadFields(issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>): Record<string, string> {
  return fieldsFromIssues(issues.map((i) => ({ ...i, path: i.path[0] === 'payload' ? i.path.slice(1) : i.path })));
}

async function visitFor(knex: Knex, user: SyncUser, visitId: string): Promise<Row> {
  // Another organisation's visit, or one assigned to someone else, answers exactly like a missing one.
  // Looked up by id alone (scoped in SQL, SQLite may walk all of the engineer's visits instead).
  const visit = (await knex('visits').where({ id: visitId }).first()) as Row | undefined;
  if (!visit || visit.organisation_id !== user.organisationId || visit.engineer_id !== user.id) throw new AppError('not_found', 'No such visit among yours.');
  return visit;
}

async function applianceAtSite(trx: Knex, visit: Row, applianceId: string, field = 'applianceId'): Promise<Row> {
  const row = (await trx('appliances').where({ id: applianceId, site_id: visit.site_id, organisation_id: visit.organisation_id }).first()) as Row | undefined;
  if (!row) throw new AppError('invalid_input', 'That appliance is not at this site.', { [field]: 'No such appliance at this site' });
  return row;
}

async function ensureInspection(ctx: Base, applianceId: string): Promise<Row> {
  const existing = (await ctx.trx('inspections').where({ visit_id: ctx.visit.id, appliance_id: applianceId }).first()) as Row | undefined;
  if (existing) return existing;
  const appliance = await applianceAtSite(ctx.trx, ctx.visit, applianceId);
  const row = {
    id: newId(),
    organisation_id: ctx.user.organisationId,
    visit_id: ctx.visit.id,
    appliance_id: applianceId,
    appliance_json: JSON.stringify(applianceDetailsFromRow(appliance)),
    checklist_json: '{}',
    created_at: ctx.now,
    updated_at: ctx.now,
  };
  await ctx.trx('inspections').insert(row);
  return row;
}

async function checkAnalyser(ctx: Base, analyserId: string | null, field: string): Promise<Row | null> {
  if (analyserId === null) return null;
  const row = (await ctx.trx('analysers').where({ id: analyserId, organisation_id: ctx.user.organisationId }).first()) as Row | undefined;
  if (!row) throw new AppError('invalid_input', 'That analyser is not in your register.', { [field]: 'No such analyser in the register' });
  return row;
}

/**
 * An analyser used past its calibration date, with the engineer's reason, goes into the office's
 * register of overrides (migration 030), once per visit, analyser and reason, so review sees it.
 */
async function recordOverride(ctx: Base, analyser: Row | null, reason: string | null): Promise<void> {
  if (!analyser || !reason) return;
  const due = toDateOnly(analyser.calibration_due) ?? '';
  if (!calibrationOverdue(due, ctx.now.slice(0, 10))) return;
  const seen = await ctx.trx('analyser_overrides').where({ visit_id: ctx.visit.id, analyser_id: analyser.id, reason }).first('id');
  if (seen) return;
  await ctx.trx('analyser_overrides').insert({
    id: newId(),
    organisation_id: ctx.user.organisationId,
    analyser_id: analyser.id,
    visit_id: ctx.visit.id,
    engineer_id: ctx.user.id,
    reason,
    calibration_due: due,
    at: ctx.now,
  });
}

function sameDetails(row: Row, details: ApplianceDetails): boolean {
  const stored = applianceColumns(applianceDetailsFromRow(row));
  const given = applianceColumns(details);
  return Object.keys(given).every((k) => (stored[k] ?? null) === (given[k] ?? null));
}

function detailsSummary(office: ApplianceDetails, engineer: ApplianceDetails): string {
  const changed = (Object.keys(engineer) as Array<keyof ApplianceDetails>)
    .filter((k) => (office[k] ?? null) !== (engineer[k] ?? null))
    .map((k) => `${k}: office "${office[k] ?? '—'}", engineer "${engineer[k] ?? '—'}"`);
  return `The office changed this appliance while the engineer was recording; both versions are kept. ${changed.join('; ')}`;
}

async function addConflict(ctx: Base, input: { kind: 'appliance_details' | 'reading'; applianceId: string; server: unknown; client: unknown; summary: string }) {
  await ctx.trx('sync_conflicts').insert({
    id: newId(),
    organisation_id: ctx.user.organisationId,
    visit_id: ctx.visit.id,
    appliance_id: input.applianceId,
    kind: input.kind,
    mutation_id: ctx.mutation.id,
    server_json: JSON.stringify(input.server),
    client_json: JSON.stringify(input.client),
    summary: input.summary,
    created_at: ctx.now,
  });
}

async function applyInspectionSave(ctx: Ctx<'inspection.save'>): Promise<Outcome> {
  const p = ctx.mutation.payload;
  const appliance = await applianceAtSite(ctx.trx, ctx.visit, p.applianceId);
  const inspection = await ensureInspection(ctx, p.applianceId);
  const analyser = await checkAnalyser(ctx, p.analyserId, 'analyserId');
  await recordOverride(ctx, analyser, p.analyserOverrideReason);
  let heat: { grossKw: number; netKw: number } | null = null;
  if (p.meterTest) {
    try {
      heat = heatInputKw({ fuel: p.details.fuel, ...p.meterTest });
    } catch (err) {
      if (err instanceof CombustionInputError) throw new AppError('invalid_input', err.message, { [`meterTest.${err.field}`]: err.message });
      throw err;
    }
  }

  let conflict = false;
  const update: Row = {
    appliance_json: JSON.stringify(p.details),
    details_confirmed: p.detailsConfirmed,
    checklist_json: JSON.stringify(p.checklist),
    spillage: p.spillage,
    operating_pressure_mbar: p.operatingPressureMbar,
    meter_test_json: p.meterTest ? JSON.stringify(p.meterTest) : null,
    heat_input_gross_kw: heat?.grossKw ?? null,
    heat_input_net_kw: heat?.netKw ?? null,
    analyser_id: p.analyserId,
    analyser_override_reason: p.analyserOverrideReason,
    notes: p.notes,
    not_tested_reason: p.notTestedReason,
    updated_at: ctx.now,
  };
  if (!sameDetails(appliance, p.details)) {
    const current = toIso(appliance.updated_at);
    const ours = current !== null && (current === p.baseUpdatedAt || current === toIso(inspection.appliance_written_at));
    if (ours) {
      await ctx.trx('appliances').where({ id: p.applianceId }).update({ ...applianceColumns(p.details), updated_at: ctx.now });
      update.appliance_written_at = ctx.now;
    } else {
      // The office edited the record since the device last saw it: keep the office's record, keep
      // the engineer's version on the inspection (it is what was tested), and flag it once.
      conflict = true;
      const office = applianceDetailsFromRow(appliance);
      const open = (await ctx.trx('sync_conflicts')
        .where({ visit_id: ctx.visit.id, appliance_id: p.applianceId, kind: 'appliance_details', client_json: JSON.stringify(p.details) })
        .whereNull('resolved_at')
        .first()) as Row | undefined;
      if (!open) await addConflict(ctx, { kind: 'appliance_details', applianceId: p.applianceId, server: office, client: p.details, summary: detailsSummary(office, p.details) });
    }
  }
  await ctx.trx('inspections').where({ id: inspection.id }).update(update);
  return { conflict };
}

const READING_FIELD: Record<string, string> = { coPpm: 'values.coPpm', co2Pct: 'values.co2Pct', o2Pct: 'values.o2Pct', flueTempC: 'values.flueTemp', airTempC: 'values.airTemp' };

/** A reading's values in canonical units, analysed for its appliance's fuel; a bad value is refused naming its field. */
function checkedReading(raw: MutationOf<'reading.record'>['payload']['values'], inspection: Row): ReturnType<typeof canonicalReading> {
  const values = canonicalReading(raw);
  const details = JSON.parse(String(inspection.appliance_json)) as ApplianceDetails;
  const check = analyseReading(values, details.fuel);
  if (check.error) {
    const field = READING_FIELD[check.error.field] ?? check.error.field;
    throw new AppError('invalid_input', check.error.message, { [field]: check.error.message });
  }
  return values;
}

/** The readings row for a recorded reading (one place for both the single and the batch path). */
function readingRow(
  p: MutationOf<'reading.record'>['payload'],
  values: ReturnType<typeof canonicalReading>,
  inspectionId: string,
  user: { id: string; organisationId: string },
  now: string,
): Row {
  return {
    id: p.readingId,
    organisation_id: user.organisationId,
    inspection_id: inspectionId,
    test_point: p.testPoint,
    replaces_id: p.replacesId,
    co_ppm: values.coPpm,
    co2_pct: values.co2Pct,
    o2_pct: values.o2Pct,
    flue_temp_c: values.flueTempC,
    air_temp_c: values.airTempC,
    temp_unit: values.tempUnit,
    analyser_id: p.analyserId,
    taken_at: p.takenAt,
    recorded_by: user.id,
    created_at: now,
  };
}

async function applyReading(ctx: Ctx<'reading.record'>): Promise<Outcome> {
  const p = ctx.mutation.payload;
  const inspection = await ensureInspection(ctx, p.applianceId);
  const analyser = await checkAnalyser(ctx, p.analyserId, 'analyserId');
  const values = checkedReading(p.values, inspection);
  if (await ctx.trx('readings').where({ id: p.readingId }).first()) throw new AppError('conflict', 'A reading with this id is already recorded.', { readingId: 'Already recorded' });

  const existing: Row[] = await ctx.trx('readings').where({ inspection_id: inspection.id, test_point: p.testPoint });
  let conflict = false;
  if (p.replacesId !== null) {
    const replaced = existing.find((r) => r.id === p.replacesId);
    if (!replaced) throw new AppError('invalid_input', 'The reading being corrected is not at this test point.', { replacesId: 'No such reading at this test point' });
    const alreadyReplaced = existing.find((r) => r.replaces_id === p.replacesId);
    if (alreadyReplaced) {
      conflict = true;
      await addConflict(ctx, { kind: 'reading', applianceId: p.applianceId, server: { readingId: alreadyReplaced.id }, client: { readingId: p.readingId }, summary: `Two corrections of the same ${p.testPoint.replace('_', ' ')} reading; both are kept and both are judged.` });
    }
  } else {
    const live = currentReadings(existing.map((r) => ({ id: String(r.id), replacesId: (r.replaces_id as string | null) ?? null, testPoint: String(r.test_point), takenAt: toIso(r.taken_at) ?? '', recordedBy: r.recorded_by })));
    const someoneElse = live.find((r) => r.recordedBy !== ctx.user.id);
    if (someoneElse) {
      conflict = true;
      await addConflict(ctx, { kind: 'reading', applianceId: p.applianceId, server: { readingId: someoneElse.id }, client: { readingId: p.readingId }, summary: `Another ${p.testPoint.replace('_', ' ')} reading was recorded by someone else; both are kept and both are judged.` });
    }
  }

  await ctx.trx('readings').insert(readingRow(p, values, String(inspection.id), ctx.user, ctx.now));
  const warnings: string[] = [];
  if (analyser && values.coPpm > Number(analyser.co_range_max_ppm)) {
    warnings.push(`CO ${values.coPpm} ppm is above the analyser's range (${Number(analyser.co_range_max_ppm)} ppm): the true value may be higher.`);
  }
  return { conflict, warnings };
}

/** Upserts a row the device identifies by its own id; an id already used elsewhere is refused. */
async function upsertOwned(ctx: Base, table: string, id: string, columns: Row): Promise<void> {
  const existing = (await ctx.trx(table).where({ id }).first()) as Row | undefined;
  if (existing && (existing.visit_id !== ctx.visit.id || existing.organisation_id !== ctx.user.organisationId)) {
    throw new AppError('conflict', 'This id belongs to another record.', { id: 'Already used elsewhere' });
  }
  if (existing) await ctx.trx(table).where({ id }).update(columns);
  else await ctx.trx(table).insert({ id, organisation_id: ctx.user.organisationId, visit_id: ctx.visit.id, created_at: ctx.now, ...columns });
}

async function optionalAppliance(ctx: Base, applianceId: string | null): Promise<void> {
  if (applianceId !== null) await applianceAtSite(ctx.trx, ctx.visit, applianceId);
}

async function applySubmit(ctx: Ctx<'visit.submit'>): Promise<Outcome> {
  const { trx, visit } = ctx;
  const limits = ctx.prepared.limits!;
  const timeZone = ctx.prepared.timeZone ?? 'UTC';
  const records = await loadVisitRecords(trx, String(visit.id));
  const applianceRows: Row[] = await trx('appliances').where({ site_id: visit.site_id, organisation_id: visit.organisation_id, active: true }).orderBy('created_at').orderBy('id');
  const arrivedAt = toIso(visit.arrived_at) ?? ctx.mutation.at;
  const date = localDate(arrivedAt, timeZone);

  const appliances = applianceRows.map((a) => {
    const inspection = records.inspections.find((i) => i.applianceId === a.id);
    const details = inspection?.details ?? applianceDetailsFromRow(a);
    return { applianceId: String(a.id), details, inspection, label: [details.location, details.make, details.model].filter(Boolean).join(' ') };
  });
  // The server recomputes from the raw readings: nothing the device worked out is trusted.
  const verdicts = visitVerdicts({
    appliances: appliances.map((a) => ({
      applianceId: a.applianceId,
      details: a.details,
      spillage: a.inspection?.spillage ?? null,
      readings: a.inspection?.readings ?? [],
      notTestedReason: a.inspection?.notTestedReason ?? null,
    })),
    roomChecks: records.roomChecks,
    tightness: records.tightness,
    findings: records.findings,
    makeSafe: records.makeSafe,
    limits,
    date,
  });
  const analyserRows: Row[] = await trx('analysers').where({ organisation_id: ctx.user.organisationId });
  const blockers = submitBlockers({
    appliances: appliances.map((a) => ({
      applianceId: a.applianceId,
      label: a.label,
      readings: a.inspection?.readings ?? [],
      notTestedReason: a.inspection?.notTestedReason ?? null,
      analyserId: a.inspection?.analyserId ?? null,
      analyserOverrideReason: a.inspection?.analyserOverrideReason ?? null,
    })),
    analysers: analyserRows.map((r) => ({ id: String(r.id), serial: String(r.serial), calibrationDue: toDateOnly(r.calibration_due) ?? '' })),
    verdicts,
    hasSignoff: records.signoff !== null,
    date,
  });
  if (blockers.length > 0) {
    throw new AppError('invalid_input', `The visit cannot be submitted yet: ${blockers.map((b) => b.message).join('; ')}`, Object.fromEntries(blockers.map((b) => [b.key, b.message])));
  }

  const client = ctx.mutation.payload.clientVerdicts;
  const differences: Array<{ subject: string; applianceId: string | null; client: string; server: string }> = [];
  for (const a of appliances) {
    const result = verdicts.appliances[a.applianceId];
    if (!a.inspection) continue;
    const clientLevel = client.appliances[a.applianceId] ?? null;
    await trx('inspections').where({ id: a.inspection.id }).update({
      client_verdict: clientLevel,
      verdict_of_record: result?.verdict.overall ?? null,
      verdict_json: result ? JSON.stringify(result.verdict) : null,
      limits_json: result ? JSON.stringify(result.resolved) : null,
      verdict_at: ctx.now,
    });
    if (result && clientLevel !== null && clientLevel !== result.verdict.overall) differences.push({ subject: 'appliance', applianceId: a.applianceId, client: clientLevel, server: result.verdict.overall });
  }
  const installationLevel = verdicts.installation?.verdict.overall ?? null;
  if (client.installation !== null && installationLevel !== null && client.installation !== installationLevel) {
    differences.push({ subject: 'installation', applianceId: null, client: client.installation, server: installationLevel });
  }
  if (client.overall !== verdicts.overall) differences.push({ subject: 'visit', applianceId: null, client: client.overall, server: verdicts.overall });
  for (const d of differences) {
    await trx('verdict_discrepancies').insert({
      id: newId(),
      organisation_id: ctx.user.organisationId,
      visit_id: visit.id,
      appliance_id: d.applianceId,
      subject: d.subject,
      client_verdict: d.client,
      server_verdict: d.server,
      created_at: ctx.now,
    });
    console.warn(`[sync] verdict differs on visit ${String(visit.id)} (${d.subject}${d.applianceId ? ` ${d.applianceId}` : ''}): device said ${d.client}, server says ${d.server}; the server's stands`);
  }

  await trx('visits').where({ id: visit.id }).update({
    status: 'submitted',
    // The device's time of submitting, but never later than the server's clock.
    submitted_at: ctx.mutation.at < ctx.now ? ctx.mutation.at : ctx.now,
    submitted_by: ctx.user.id,
    arrived_at: toIso(visit.arrived_at) ?? arrivedAt,
    overall_verdict: verdicts.overall,
    installation_verdict: installationLevel,
    installation_verdict_json: verdicts.installation ? JSON.stringify(verdicts.installation.verdict) : null,
    installation_limits_json: verdicts.installation ? JSON.stringify(verdicts.installation.resolved) : null,
    updated_at: ctx.now,
  });
  return { warnings: differences.length ? ['The verdict was recomputed on the server and differs from the one on the device; the server’s is the verdict of record.'] : [] };
}

async function applyOne(ctx: Ctx): Promise<Outcome> {
  const m = ctx.mutation;
  switch (m.kind) {
    case 'visit.arrive':
      return {};
    case 'appliance.add': {
      const existing = (await ctx.trx('appliances').where({ id: m.payload.applianceId }).first()) as Row | undefined;
      if (existing && existing.site_id !== ctx.visit.site_id) throw new AppError('conflict', 'This appliance id belongs to another site.', { applianceId: 'Already used elsewhere' });
      if (!existing) {
        await ctx.trx('appliances').insert({
          id: m.payload.applianceId,
          organisation_id: ctx.user.organisationId,
          site_id: ctx.visit.site_id,
          ...applianceColumns(m.payload.details),
          active: true,
          created_at: ctx.now,
          updated_at: ctx.now,
        });
      }
      return {};
    }
    case 'inspection.save':
      return applyInspectionSave(ctx as unknown as Ctx<'inspection.save'>);
    case 'reading.record':
      return applyReading(ctx as unknown as Ctx<'reading.record'>);
    case 'roomCheck.save': {
      const p = m.payload;
      await upsertOwned(ctx, 'room_checks', p.roomCheckId, { room: p.room, co_ppm: p.coPpm, minutes: p.minutes, taken_at: p.takenAt, deleted_at: null });
      return {};
    }
    case 'roomCheck.remove':
      await ctx.trx('room_checks').where({ id: m.payload.roomCheckId, visit_id: ctx.visit.id }).update({ deleted_at: ctx.now });
      return {};
    case 'tightness.save': {
      const p = m.payload;
      await upsertOwned(ctx, 'tightness_tests', p.tightnessId, { start_mbar: p.startMbar, end_mbar: p.endMbar, duration_min: p.durationMin, taken_at: p.takenAt, deleted_at: null });
      // One tightness test counts per visit: a new one replaces the earlier (kept, marked deleted).
      await ctx.trx('tightness_tests').where({ visit_id: ctx.visit.id }).whereNot({ id: p.tightnessId }).whereNull('deleted_at').update({ deleted_at: ctx.now });
      return {};
    }
    case 'finding.save': {
      const p = m.payload;
      await optionalAppliance(ctx, p.applianceId);
      await upsertOwned(ctx, 'findings', p.findingId, { appliance_id: p.applianceId, severity: p.severity, description: p.description, action: p.action, recorded_at: p.recordedAt, deleted_at: null });
      return {};
    }
    case 'finding.remove':
      await ctx.trx('findings').where({ id: m.payload.findingId, visit_id: ctx.visit.id }).update({ deleted_at: ctx.now });
      return {};
    case 'makeSafe.save': {
      const p = m.payload;
      await optionalAppliance(ctx, p.applianceId);
      await upsertOwned(ctx, 'make_safe_records', p.makeSafeId, {
        appliance_id: p.applianceId,
        made_safe_by: p.madeSafeBy,
        occupant_warned: p.occupantWarned,
        consent: p.consent,
        occupant_name: p.occupantName,
        refusal_note: p.refusalNote,
        warning_notice_left: p.warningNoticeLeft,
        notes: p.notes,
        recorded_at: p.recordedAt,
      });
      return {};
    }
    case 'signoff.save': {
      const p = m.payload;
      const signature = ctx.prepared.signature;
      if (signature) {
        await ctx.trx('photos').insert({
          id: signature.photoId,
          organisation_id: ctx.user.organisationId,
          visit_id: ctx.visit.id,
          purpose: 'signature',
          storage_key: signature.key,
          mime: signature.image.mime,
          bytes: signature.image.bytes.length,
          width: signature.image.width,
          height: signature.image.height,
          sha256: sha256(signature.image.bytes),
          uploaded_by: ctx.user.id,
          taken_at: p.signedAt,
          created_at: ctx.now,
        });
      }
      const columns = {
        organisation_id: ctx.user.organisationId,
        occupant_name: p.occupantName,
        signature_photo_id: signature?.photoId ?? null,
        no_signature_reason: signature ? null : p.noSignatureReason,
        signed_at: p.signedAt,
        declaration_text: p.declarationText,
        engineer_id: ctx.user.id,
        declared_at: p.signedAt,
      };
      const existing = await ctx.trx('visit_signoffs').where({ visit_id: ctx.visit.id }).first();
      if (existing) await ctx.trx('visit_signoffs').where({ visit_id: ctx.visit.id }).update(columns);
      else await ctx.trx('visit_signoffs').insert({ visit_id: ctx.visit.id, created_at: ctx.now, ...columns });
      return {};
    }
    case 'visit.noAccess':
      await ctx.trx('visits').where({ id: ctx.visit.id }).update({ status: 'no_access', no_access_at: m.payload.at, no_access_note: m.payload.note, submitted_by: ctx.user.id, updated_at: ctx.now });
      return {};
    case 'visit.submit':
      return applySubmit(ctx as unknown as Ctx<'visit.submit'>);
  }
}

function sha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

async function prepare(user: SyncUser, mutation: Mutation, visit: Row): Promise<Prepared> {
  if (mutation.kind === 'visit.submit') {
    const limits = await loadLimitContextForSite({ organisationId: user.organisationId, siteId: String(visit.site_id) });
    return { limits: { chain: limits.chain, orgDefault: limits.orgDefault }, timeZone: await getOrganisationTimeZone(db(), user.organisationId) };
  }
  if (mutation.kind === 'signoff.save' && mutation.payload.signaturePng) {
    const base64 = mutation.payload.signaturePng.slice(mutation.payload.signaturePng.indexOf(',') + 1);
    let image: CleanImage;
    try {
      image = await cleanImage(Buffer.from(base64, 'base64'), { keepPng: true });
    } catch (err) {
      if (err instanceof AppError) throw new AppError('invalid_input', 'The signature could not be read; ask for it again.', { signaturePng: 'Not a readable PNG image' });
      throw err;
    }
    // Named after the mutation, so a resend overwrites the same file rather than adding one.
    const key = `${user.organisationId}/${String(visit.id)}/signature-${mutation.id}.png`;
    await fileStore().put(key, image.bytes);
    return { signature: { photoId: mutation.id, key, image } };
  }
  return {};
}

type Stored = { user_id: string; organisation_id: string; result_json: string | null };

function duplicateResult(id: string, user: SyncUser, row: Stored): MutationResult {
  if (row.user_id !== user.id || row.organisation_id !== user.organisationId) {
    return rejected(id, new AppError('conflict', 'This mutation id was already used by another account.'));
  }
  const earlier = row.result_json ? (JSON.parse(row.result_json) as Outcome) : {};
  return { id, status: 'duplicate', ...(earlier.conflict ? { conflict: true } : {}) };
}

type Parsed = { mutation: Mutation; result?: undefined } | { mutation?: undefined; result: MutationResult };

function parseItem(item: unknown, index: number): Parsed {
  const rawId = item && typeof item === 'object' && typeof (item as { id?: unknown }).id === 'string' ? (item as { id: string }).id : `#${index}`;
  const parsed = mutationSchema.safeParse(item);
  if (!parsed.success) return { result: rejected(rawId, new AppError('invalid_input', 'Some fields are not valid.', payloadFields(parsed.error.issues))) };
  return { mutation: parsed.data };
}

/** One mutation in its own transaction. */
async function applyItem(user: SyncUser, mutation: Mutation): Promise<MutationResult> {
  const knex = db();
  try {
    const seen = (await knex('sync_mutations').where({ id: mutation.id }).first()) as Stored | undefined;
    if (seen) return duplicateResult(mutation.id, user, seen);
    const visit = await visitFor(knex, user, mutation.visitId);
    const prepared = await prepare(user, mutation, visit);

    const outcome = await knex.transaction(async (trx) => {
      await takeWriteLock(trx);
      // Checked again inside the transaction: the acknowledgement is only ever for a committed change.
      const again = (await trx('sync_mutations').where({ id: mutation.id }).first()) as Stored | undefined;
      if (again) return { duplicate: again, result: null };
      const current = await visitFor(trx, user, mutation.visitId);
      if (!OPEN_STATUSES.includes(String(current.status))) {
        throw new AppError('conflict', `This visit is ${String(current.status).replace('_', ' ')}; it can no longer be changed from the field.`);
      }
      const now = nowIso();
      if (current.status === 'booked' && mutation.kind !== 'visit.noAccess') {
        const arrivedAt = mutation.kind === 'visit.arrive' ? mutation.payload.arrivedAt : mutation.at;
        await trx('visits').where({ id: current.id }).update({ status: 'on_site', arrived_at: arrivedAt, updated_at: now });
        current.arrived_at = arrivedAt;
      }
      const result = await applyOne({ trx, user, visit: current, mutation, prepared, now });
      await trx('sync_mutations').insert({
        id: mutation.id,
        organisation_id: user.organisationId,
        user_id: user.id,
        visit_id: mutation.visitId,
        kind: mutation.kind,
        result_json: JSON.stringify(result),
        client_at: mutation.at,
        applied_at: now,
      });
      return { duplicate: null, result };
    });
    if (outcome.duplicate) return duplicateResult(mutation.id, user, outcome.duplicate);
    return {
      id: mutation.id,
      status: 'applied',
      ...(outcome.result?.conflict ? { conflict: true } : {}),
      ...(outcome.result?.warnings?.length ? { warnings: outcome.result.warnings } : {}),
    };
  } catch (err) {
    if (err instanceof AppError) return rejected(mutation.id, err);
    // The same mutation committed by a concurrent request (another tab, a retried request) between
    // our check and our insert: it was applied once, by the other.
    const raced = (await knex('sync_mutations').where({ id: mutation.id }).first().catch(() => undefined)) as Stored | undefined;
    if (raced) return duplicateResult(mutation.id, user, raced);
    console.error('[sync] mutation failed', mutation.id, mutation.kind, err);
    return rejected(mutation.id, new AppError('internal', 'The server could not apply this change; it will be sent again.'));
  }
}

// ---- Runs of readings ------------------------------------------------------------------------
// A phone sends mostly readings (and the arrival before them). A run of those is applied in ONE
// transaction: the rows every item needs (its visit, inspection, appliance, analyser and the
// readings already at its test point) are read once for the run, each item is checked against
// them and the rows it adds are written together at the end. Each item is checked in full before
// anything of it is written, so a refused item leaves nothing behind and the rest of the run still
// applies, as one at a time. Anything unexpected (a database error, a concurrent request that
// committed the same ids first) abandons the run's transaction and applies its items one at a time.

const BATCHED_KINDS: ReadonlySet<Mutation['kind']> = new Set(['reading.record', 'visit.arrive']);

/** A run's writes, in the order the foreign keys need. */
type RunWrites = { inspections: Row[]; visits: Map<string, Row>; conflicts: Row[]; readings: Row[]; mutations: Row[] };

type ReadingRow = { id: string; replaces_id: string | null; test_point: string; taken_at: unknown; recorded_by: unknown };

/** What a run reads once, kept up to date with the rows it adds. */
type RunState = {
  user: SyncUser;
  now: string;
  visits: Map<string, Row>;
  appliances: Map<string, Row>;
  analysers: Map<string, Row>;
  inspections: Map<string, Row>;
  /** Readings at an inspection's test point: `${inspectionId}|${testPoint}`. */
  atPoint: Map<string, ReadingRow[]>;
  readingIds: Set<string>;
  writes: RunWrites;
};

function unique<T>(values: Iterable<T>): T[] {
  return [...new Set(values)];
}

/** The few reads and writes a run makes, so SQLite can run them as cached prepared statements. */
type RunDb = {
  /** Rows of the table whose column is one of the values (and which match the scope). */
  rowsIn(table: string, column: string, values: readonly string[], scope?: Row, columns?: readonly string[]): Promise<Row[]>;
  insert(table: string, rows: readonly Row[]): Promise<void>;
  update(table: string, id: string, columns: Row): Promise<void>;
};

const IN_CHUNK = 500;

function knexRunDb(trx: Knex.Transaction): RunDb {
  return {
    async rowsIn(table, column, values, scope = {}, columns = ['*']) {
      const out: Row[] = [];
      for (let i = 0; i < values.length; i += IN_CHUNK) out.push(...((await trx(table).where(scope).whereIn(column, values.slice(i, i + IN_CHUNK)).select(columns)) as Row[]));
      return out;
    },
    async insert(table, rows) {
      // 40 rows at a time stay far below any bound-parameter limit.
      for (let i = 0; i < rows.length; i += 40) await trx(table).insert(rows.slice(i, i + 40));
    },
    async update(table, id, columns) {
      await trx(table).where({ id }).update(columns);
    },
  };
}

type SqliteStatement = { all: (...params: unknown[]) => unknown[]; run: (...params: unknown[]) => unknown };
type SqliteConnection = { prepare: (sql: string) => SqliteStatement };

const statements = new WeakMap<object, Map<string, SqliteStatement>>();

/**
 * The same on better-sqlite3, straight on the transaction's connection: statements are prepared
 * once per connection and reused, which spares the query builder and SQLite's parser per row.
 * Table and column names here are this module's own constants; every value is a bound parameter.
 */
function sqliteRunDb(conn: SqliteConnection): RunDb {
  let cache = statements.get(conn);
  if (!cache) statements.set(conn, (cache = new Map()));
  const prepared = (sql: string): SqliteStatement => {
    let st = cache.get(sql);
    if (!st) {
      if (cache.size > 500) cache.clear();
      st = conn.prepare(sql);
      cache.set(sql, st);
    }
    return st;
  };
  const bind = (v: unknown) => (typeof v === 'boolean' ? (v ? 1 : 0) : v === undefined ? null : v);
  const quote = (name: string) => `"${name}"`;
  return {
    async rowsIn(table, column, values, scope = {}, columns = ['*']) {
      const out: Row[] = [];
      const scoped = Object.keys(scope);
      const cols = columns.map((c) => (c === '*' ? c : quote(c))).join(', ');
      for (let i = 0; i < values.length; i += IN_CHUNK) {
        const chunk = values.slice(i, i + IN_CHUNK);
        const where = [...scoped.map((k) => `${quote(k)} = ?`), `${quote(column)} in (${chunk.map(() => '?').join(', ')})`].join(' and ');
        out.push(...(prepared(`select ${cols} from ${quote(table)} where ${where}`).all(...scoped.map((k) => bind(scope[k])), ...chunk) as Row[]));
      }
      return out;
    },
    async insert(table, rows) {
      for (const row of rows) {
        const keys = Object.keys(row);
        prepared(`insert into ${quote(table)} (${keys.map(quote).join(', ')}) values (${keys.map(() => '?').join(', ')})`).run(...keys.map((k) => bind(row[k])));
      }
    },
    async update(table, id, columns) {
      const keys = Object.keys(columns);
      prepared(`update ${quote(table)} set ${keys.map((k) => `${quote(k)} = ?`).join(', ')} where "id" = ?`).run(...keys.map((k) => bind(columns[k])), id);
    },
  };
}

async function runDb(trx: Knex.Transaction): Promise<RunDb> {
  const client = trx.client as { driverName?: string; acquireConnection: () => Promise<unknown> };
  if (client.driverName === 'better-sqlite3') return sqliteRunDb((await client.acquireConnection()) as SqliteConnection);
  return knexRunDb(trx);
}

/** Checks a reading against the run's rows and, only when all is well, adds its rows to the writes. */
function stageReading(state: RunState, visit: Row, mutation: MutationOf<'reading.record'>): Outcome {
  const p = mutation.payload;
  const { user, now, writes } = state;
  const inspectionKey = `${String(visit.id)}|${p.applianceId}`;
  let inspection = state.inspections.get(inspectionKey);
  let newInspection: Row | null = null;
  if (!inspection) {
    const appliance = state.appliances.get(p.applianceId);
    if (!appliance || appliance.site_id !== visit.site_id || appliance.organisation_id !== visit.organisation_id) {
      throw new AppError('invalid_input', 'That appliance is not at this site.', { applianceId: 'No such appliance at this site' });
    }
    newInspection = {
      id: newId(),
      organisation_id: user.organisationId,
      visit_id: visit.id,
      appliance_id: p.applianceId,
      appliance_json: JSON.stringify(applianceDetailsFromRow(appliance)),
      checklist_json: '{}',
      created_at: now,
      updated_at: now,
    };
    inspection = newInspection;
  }
  let analyser: Row | null = null;
  if (p.analyserId !== null) {
    analyser = state.analysers.get(p.analyserId) ?? null;
    if (!analyser) throw new AppError('invalid_input', 'That analyser is not in your register.', { analyserId: 'No such analyser in the register' });
  }
  const values = checkedReading(p.values, inspection);
  if (state.readingIds.has(p.readingId)) throw new AppError('conflict', 'A reading with this id is already recorded.', { readingId: 'Already recorded' });

  const pointKey = `${String(inspection.id)}|${p.testPoint}`;
  const existing = state.atPoint.get(pointKey) ?? [];
  let conflict: { server: unknown; summary: string } | null = null;
  if (p.replacesId !== null) {
    const replaced = existing.find((r) => r.id === p.replacesId);
    if (!replaced) throw new AppError('invalid_input', 'The reading being corrected is not at this test point.', { replacesId: 'No such reading at this test point' });
    const alreadyReplaced = existing.find((r) => r.replaces_id === p.replacesId);
    if (alreadyReplaced) conflict = { server: { readingId: alreadyReplaced.id }, summary: `Two corrections of the same ${p.testPoint.replace('_', ' ')} reading; both are kept and both are judged.` };
  } else {
    const live = currentReadings(existing.map((r) => ({ id: r.id, replacesId: r.replaces_id ?? null, testPoint: r.test_point, takenAt: toIso(r.taken_at) ?? '', recordedBy: r.recorded_by })));
    const someoneElse = live.find((r) => r.recordedBy !== user.id);
    if (someoneElse) conflict = { server: { readingId: someoneElse.id }, summary: `Another ${p.testPoint.replace('_', ' ')} reading was recorded by someone else; both are kept and both are judged.` };
  }

  // Checked: from here on nothing refuses the item.
  if (newInspection) {
    writes.inspections.push(newInspection);
    state.inspections.set(inspectionKey, newInspection);
  }
  if (conflict) {
    writes.conflicts.push({
      id: newId(),
      organisation_id: user.organisationId,
      visit_id: visit.id,
      appliance_id: p.applianceId,
      kind: 'reading',
      mutation_id: mutation.id,
      server_json: JSON.stringify(conflict.server),
      client_json: JSON.stringify({ readingId: p.readingId }),
      summary: conflict.summary,
      created_at: now,
    });
  }
  writes.readings.push(readingRow(p, values, String(inspection.id), user, now));
  state.readingIds.add(p.readingId);
  state.atPoint.set(pointKey, [...existing, { id: p.readingId, replaces_id: p.replacesId, test_point: p.testPoint, taken_at: p.takenAt, recorded_by: user.id }]);
  const warnings: string[] = [];
  if (analyser && values.coPpm > Number(analyser.co_range_max_ppm)) {
    warnings.push(`CO ${values.coPpm} ppm is above the analyser's range (${Number(analyser.co_range_max_ppm)} ppm): the true value may be higher.`);
  }
  return { conflict: conflict !== null, warnings };
}

async function applyRunInOneTransaction(user: SyncUser, mutations: readonly Mutation[]): Promise<MutationResult[]> {
  return db().transaction(async (trx) => {
    await takeWriteLock(trx);
    const now = nowIso();
    const q = await runDb(trx);
    const writes: RunWrites = { inspections: [], visits: new Map(), conflicts: [], readings: [], mutations: [] };
    const seen = new Map((await q.rowsIn('sync_mutations', 'id', unique(mutations.map((m) => m.id)))).map((r) => [String(r.id), r as unknown as Stored]));
    const fresh = mutations.filter((m) => !seen.has(m.id));
    const visitIds = unique(fresh.map((m) => m.visitId));
    const readings = fresh.filter((m): m is MutationOf<'reading.record'> => m.kind === 'reading.record').map((m) => m.payload);
    const applianceIds = unique(readings.map((p) => p.applianceId));
    const analyserIds = unique(readings.flatMap((p) => (p.analyserId === null ? [] : [p.analyserId])));
    // Another organisation's visit, or one assigned to someone else, is simply not found. Read by
    // id alone and checked here: scoped in SQL, SQLite walks all of the engineer's visits instead.
    const visits = (await q.rowsIn('visits', 'id', visitIds)).filter((v) => v.organisation_id === user.organisationId && v.engineer_id === user.id);
    const inspections = applianceIds.length ? await q.rowsIn('inspections', 'visit_id', visits.map((v) => String(v.id)), {}) : [];
    const wanted = new Set(applianceIds);
    const ownInspections = inspections.filter((i) => wanted.has(String(i.appliance_id)));
    const state: RunState = {
      user,
      now,
      visits: new Map(visits.map((v) => [String(v.id), v])),
      appliances: new Map((await q.rowsIn('appliances', 'id', applianceIds, { organisation_id: user.organisationId })).map((a) => [String(a.id), a])),
      analysers: new Map((await q.rowsIn('analysers', 'id', analyserIds, { organisation_id: user.organisationId })).map((a) => [String(a.id), a])),
      inspections: new Map(ownInspections.map((i) => [`${String(i.visit_id)}|${String(i.appliance_id)}`, i])),
      atPoint: new Map(),
      readingIds: new Set((await q.rowsIn('readings', 'id', unique(readings.map((p) => p.readingId)), {}, ['id'])).map((r) => String(r.id))),
      writes,
    };
    const atPoint = await q.rowsIn('readings', 'inspection_id', ownInspections.map((i) => String(i.id)), {}, ['id', 'inspection_id', 'test_point', 'replaces_id', 'taken_at', 'recorded_by']);
    for (const r of atPoint) {
      const key = `${String(r.inspection_id)}|${String(r.test_point)}`;
      const list = state.atPoint.get(key) ?? [];
      list.push(r as unknown as ReadingRow);
      state.atPoint.set(key, list);
    }

    const appliedHere = new Map<string, Outcome>();
    const results: MutationResult[] = [];
    for (const mutation of mutations) {
      const earlier = seen.get(mutation.id);
      if (earlier) {
        results.push(duplicateResult(mutation.id, user, earlier));
        continue;
      }
      const here = appliedHere.get(mutation.id);
      if (here) {
        results.push({ id: mutation.id, status: 'duplicate', ...(here.conflict ? { conflict: true } : {}) });
        continue;
      }
      try {
        const visit = state.visits.get(mutation.visitId);
        if (!visit) throw new AppError('not_found', 'No such visit among yours.');
        if (!OPEN_STATUSES.includes(String(visit.status))) {
          throw new AppError('conflict', `This visit is ${String(visit.status).replace('_', ' ')}; it can no longer be changed from the field.`);
        }
        const outcome = mutation.kind === 'reading.record' ? stageReading(state, visit, mutation as MutationOf<'reading.record'>) : {};
        if (visit.status === 'booked') {
          const arrivedAt = mutation.kind === 'visit.arrive' ? mutation.payload.arrivedAt : mutation.at;
          visit.status = 'on_site';
          visit.arrived_at = arrivedAt;
          writes.visits.set(String(visit.id), { status: 'on_site', arrived_at: arrivedAt, updated_at: now });
        }
        writes.mutations.push({
          id: mutation.id,
          organisation_id: user.organisationId,
          user_id: user.id,
          visit_id: mutation.visitId,
          kind: mutation.kind,
          result_json: JSON.stringify(outcome),
          client_at: mutation.at,
          applied_at: now,
        });
        appliedHere.set(mutation.id, outcome);
        results.push({
          id: mutation.id,
          status: 'applied',
          ...(outcome.conflict ? { conflict: true } : {}),
          ...(outcome.warnings?.length ? { warnings: outcome.warnings } : {}),
        });
      } catch (err) {
        if (err instanceof AppError) results.push(rejected(mutation.id, err));
        else throw err;
      }
    }

    await q.insert('inspections', writes.inspections);
    for (const [id, columns] of writes.visits) await q.update('visits', id, columns);
    await q.insert('sync_conflicts', writes.conflicts);
    await q.insert('readings', writes.readings);
    await q.insert('sync_mutations', writes.mutations);
    return results;
  });
}

async function applyRun(user: SyncUser, mutations: readonly Mutation[]): Promise<MutationResult[]> {
  try {
    return await applyRunInOneTransaction(user, mutations);
  } catch (err) {
    // Rolled back as a whole: each item again on its own, which sorts out races item by item.
    console.warn('[sync] a run of readings fell back to one at a time:', err instanceof Error ? err.message : err);
    const results: MutationResult[] = [];
    for (const m of mutations) results.push(await applyItem(user, m));
    return results;
  }
}

/**
 * Applies a batch in order; one result per item, each acknowledged only after its commit. Runs of
 * readings (and arrivals) share one transaction; every other kind is applied on its own.
 */
export async function applySyncBatch(input: { user: SyncUser; items: readonly unknown[] }): Promise<MutationResult[]> {
  const parsed = input.items.map((item, i) => parseItem(item, i));
  const results: MutationResult[] = [];
  let i = 0;
  while (i < parsed.length) {
    const item = parsed[i]!;
    if (item.result) {
      results.push(item.result);
      i++;
      continue;
    }
    if (!BATCHED_KINDS.has(item.mutation.kind)) {
      results.push(await applyItem(input.user, item.mutation));
      i++;
      continue;
    }
    // A run: consecutive batched kinds, with refused-at-parse items passed through in place.
    const run: Mutation[] = [];
    const slots: Array<MutationResult | null> = [];
    while (i < parsed.length && (parsed[i]!.result || BATCHED_KINDS.has(parsed[i]!.mutation!.kind))) {
      const p = parsed[i]!;
      if (p.result) slots.push(p.result);
      else {
        run.push(p.mutation!);
        slots.push(null);
      }
      i++;
    }
    const applied = await applyRun(input.user, run);
    let k = 0;
    for (const slot of slots) results.push(slot ?? applied[k++]!);
  }
  return results;
}
