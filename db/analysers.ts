import 'server-only';
// The analyser register: serials, calibration dates, who holds which, and the override reasons
// engineers give when they use one past its calibration date.
import { db } from './knex';
import { toBool, toDateOnly, toIso, toNum } from './rows';
import { recordAudit, type Actor } from './audit';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import { analyserStatus, type AnalyserStatus } from '@/lib/analysers';
import { dateInZone } from '@/lib/renewals/dates';
import { escapeLike } from '@/lib/validations/list-query';
import type { AnalyserData, AnalyserListQuery } from '@/lib/validations/analysers';
import type { Page } from './sites';

export type Analyser = {
  id: string;
  serial: string;
  make: string;
  model: string;
  calibratedOn: string;
  calibrationDue: string;
  coRangeMaxPpm: number;
  assignedTo: string | null;
  assignedName: string | null;
  active: boolean;
  status: AnalyserStatus;
};

const SORTS: Record<AnalyserListQuery['sort'], string> = { due: 'a.calibration_due', serial: 'a.serial', model: 'a.model', calibrated: 'a.calibrated_on' };

async function clock(organisationId: string): Promise<{ today: string; warningDays: number }> {
  const row = await db()('organisations').where({ id: organisationId }).first('time_zone', 'calibration_warning_days');
  return { today: dateInZone(new Date(), String(row?.time_zone ?? 'Europe/London')), warningDays: Number(row?.calibration_warning_days ?? 30) };
}

function toAnalyser(r: Record<string, unknown>, c: { today: string; warningDays: number }): Analyser {
  const calibrationDue = toDateOnly(r.calibration_due) ?? '';
  return {
    id: String(r.id), serial: String(r.serial), make: String(r.make), model: String(r.model), calibratedOn: toDateOnly(r.calibrated_on) ?? '', calibrationDue,
    coRangeMaxPpm: toNum(r.co_range_max_ppm) ?? 0, assignedTo: (r.assigned_to as string | null) ?? null, assignedName: (r.assigned_name as string | null) ?? null,
    active: toBool(r.active), status: analyserStatus({ calibrationDue }, c.today, c.warningDays),
  };
}

function base(organisationId: string) {
  return db()('analysers as a').leftJoin('users as u', 'u.id', 'a.assigned_to').where('a.organisation_id', organisationId).select('a.*', 'u.name as assigned_name');
}

export async function listAnalysers(organisationId: string, query: AnalyserListQuery): Promise<Page<Analyser>> {
  const c = await clock(organisationId);
  const q = base(organisationId).andWhere('a.active', true);
  if (query.q) {
    const like = escapeLike(query.q);
    q.andWhere((w) => w.whereRaw('lower(a.serial) like ?', [like]).orWhereRaw('lower(a.model) like ?', [like]).orWhereRaw('lower(a.make) like ?', [like]));
  }
  // Calibration state depends on today's date, so the filter is a date range on the due column.
  const soon = new Date(Date.parse(`${c.today}T00:00:00Z`) + c.warningDays * 86400_000).toISOString().slice(0, 10);
  if (query.state === 'overdue') q.andWhere('a.calibration_due', '<', c.today);
  if (query.state === 'due_soon') q.andWhere('a.calibration_due', '>=', c.today).andWhere('a.calibration_due', '<=', soon);
  if (query.state === 'ok') q.andWhere('a.calibration_due', '>', soon);
  const [{ count }] = await q.clone().clearSelect().count<{ count: number | string }[]>({ count: '*' });
  const rows = await q.clone().orderBy(SORTS[query.sort], query.dir).orderBy('a.id').limit(query.pageSize).offset((query.page - 1) * query.pageSize);
  return { items: rows.map((r: Record<string, unknown>) => toAnalyser(r, c)), total: Number(count), page: query.page, pageSize: query.pageSize };
}

export async function getAnalyser(organisationId: string, id: string): Promise<Analyser | null> {
  const row = await base(organisationId).andWhere('a.id', id).first();
  return row ? toAnalyser(row, await clock(organisationId)) : null;
}

function row(data: AnalyserData) {
  return { serial: data.serial, make: data.make, model: data.model, calibrated_on: data.calibratedOn, calibration_due: data.calibrationDue, co_range_max_ppm: data.coRangeMaxPpm, assigned_to: data.assignedTo };
}

async function check(organisationId: string, data: AnalyserData, exceptId?: string): Promise<void> {
  const dup = db()('analysers').where({ organisation_id: organisationId, serial: data.serial });
  if (exceptId) dup.whereNot({ id: exceptId });
  if (await dup.first('id')) throw new AppError('conflict', 'Another analyser has this serial.', { serial: 'Another analyser has this serial' });
  if (data.assignedTo && !(await db()('users').where({ id: data.assignedTo, organisation_id: organisationId, role: 'engineer' }).first('id'))) {
    throw new AppError('invalid_input', 'Some fields are not valid.', { assignedTo: 'No such engineer' });
  }
}

export async function createAnalyser(actor: Actor, data: AnalyserData): Promise<Analyser> {
  await check(actor.organisationId, data);
  const id = newId();
  await db().transaction(async (trx) => {
    const now = new Date().toISOString();
    await trx('analysers').insert({ id, organisation_id: actor.organisationId, ...row(data), active: true, created_at: now, updated_at: now });
    await recordAudit(trx, { actor, entity: 'analyser', entityId: id, action: 'create', summary: `Added analyser ${data.serial} (${data.make} ${data.model}), due ${data.calibrationDue}`, after: { ...data } });
  });
  return (await getAnalyser(actor.organisationId, id))!;
}

export async function updateAnalyser(actor: Actor, id: string, data: AnalyserData): Promise<Analyser | null> {
  const before = await getAnalyser(actor.organisationId, id);
  if (!before) return null;
  await check(actor.organisationId, data, id);
  await db().transaction(async (trx) => {
    await trx('analysers').where({ id, organisation_id: actor.organisationId }).update({ ...row(data), updated_at: new Date().toISOString() });
    const was = { serial: before.serial, make: before.make, model: before.model, calibratedOn: before.calibratedOn, calibrationDue: before.calibrationDue, coRangeMaxPpm: before.coRangeMaxPpm, assignedTo: before.assignedTo };
    await recordAudit(trx, { actor, entity: 'analyser', entityId: id, action: 'update', summary: `Changed analyser ${data.serial}`, before: was, after: { ...data } });
  });
  return getAnalyser(actor.organisationId, id);
}

export type AnalyserOverride = { id: string; analyserId: string; serial: string; visitId: string | null; engineerId: string; engineerName: string; reason: string; calibrationDue: string; at: string };

/** Records why an engineer used an analyser past its calibration date (shown at review). */
export async function recordAnalyserOverride(input: { organisationId: string; engineerId: string; analyserId: string; visitId?: string | null; reason: string }): Promise<AnalyserOverride> {
  const analyser = await getAnalyser(input.organisationId, input.analyserId);
  if (!analyser) throw new AppError('not_found', 'No such analyser.');
  if (input.visitId && !(await db()('visits').where({ id: input.visitId, organisation_id: input.organisationId }).first('id'))) throw new AppError('not_found', 'No such visit.');
  const id = newId();
  await db()('analyser_overrides').insert({ id, organisation_id: input.organisationId, analyser_id: analyser.id, visit_id: input.visitId ?? null, engineer_id: input.engineerId, reason: input.reason, calibration_due: analyser.calibrationDue, at: new Date().toISOString() });
  return (await listAnalyserOverrides(input.organisationId, { analyserId: analyser.id })).find((o) => o.id === id)!;
}

export async function listAnalyserOverrides(organisationId: string, filter: { visitId?: string; analyserId?: string } = {}): Promise<AnalyserOverride[]> {
  const q = db()('analyser_overrides as o').join('analysers as a', 'a.id', 'o.analyser_id').join('users as u', 'u.id', 'o.engineer_id').where('o.organisation_id', organisationId);
  if (filter.visitId) q.andWhere('o.visit_id', filter.visitId);
  if (filter.analyserId) q.andWhere('o.analyser_id', filter.analyserId);
  const rows = await q.select('o.*', 'a.serial', 'u.name as engineer_name').orderBy('o.at', 'desc').limit(200);
  return rows.map((r: Record<string, unknown>) => ({
    id: String(r.id), analyserId: String(r.analyser_id), serial: String(r.serial), visitId: (r.visit_id as string | null) ?? null, engineerId: String(r.engineer_id),
    engineerName: String(r.engineer_name), reason: String(r.reason), calibrationDue: toDateOnly(r.calibration_due) ?? '', at: toIso(r.at) ?? '',
  }));
}
