import 'server-only';
// Appliances at the organisation's sites: list, read, write (audited), bulk import, retire.
import type { Knex } from 'knex';
import { db } from './knex';
import { toBool, toIso, toNum } from './rows';
import { recordAudit, type Actor } from './audit';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';
import { escapeLike } from '@/lib/validations/list-query';
import type { ApplianceData, ApplianceListQuery } from '@/lib/validations/appliances';
import type { Page } from './sites';

export type Appliance = {
  id: string;
  siteId: string;
  siteReference: string;
  siteAddress: string;
  category: string;
  fuel: string;
  flueType: string;
  location: string;
  make: string | null;
  model: string | null;
  serial: string | null;
  ratedInputKw: number | null;
  mfrRatioMax: number | null;
  mfrCoAirFreeMaxPpm: number | null;
  mfrCoMaxPpm: number | null;
  active: boolean;
  updatedAt: string;
};

const SORTS: Record<ApplianceListQuery['sort'], string> = { site: 's.reference', category: 'a.category', fuel: 'a.fuel', location: 'a.location', make: 'a.make', updated: 'a.updated_at' };

function toAppliance(r: Record<string, unknown>): Appliance {
  return {
    id: String(r.id),
    siteId: String(r.site_id),
    siteReference: String(r.reference ?? ''),
    siteAddress: [r.address_line1, r.town].filter(Boolean).join(', '),
    category: String(r.category),
    fuel: String(r.fuel),
    flueType: String(r.flue_type),
    location: String(r.location),
    make: (r.make as string | null) ?? null,
    model: (r.model as string | null) ?? null,
    serial: (r.serial as string | null) ?? null,
    ratedInputKw: toNum(r.rated_input_kw),
    mfrRatioMax: toNum(r.mfr_ratio_max),
    mfrCoAirFreeMaxPpm: toNum(r.mfr_co_air_free_max_ppm),
    mfrCoMaxPpm: toNum(r.mfr_co_max_ppm),
    active: toBool(r.active),
    updatedAt: toIso(r.updated_at) ?? '',
  };
}

function base(organisationId: string) {
  return db()('appliances as a').join('sites as s', 's.id', 'a.site_id').where('a.organisation_id', organisationId);
}

const COLUMNS = ['a.*', 's.reference', 's.address_line1', 's.town'];

export async function listAppliances(organisationId: string, query: ApplianceListQuery): Promise<Page<Appliance>> {
  const q = base(organisationId).andWhere('a.active', true);
  if (query.siteId) q.andWhere('a.site_id', query.siteId);
  if (query.category) q.andWhere('a.category', query.category);
  if (query.q) {
    const like = escapeLike(query.q);
    q.andWhere((w) =>
      w.whereRaw("lower(a.make) like ? escape '\\'", [like]).orWhereRaw("lower(a.model) like ? escape '\\'", [like]).orWhereRaw("lower(a.serial) like ? escape '\\'", [like])
        .orWhereRaw("lower(a.location) like ? escape '\\'", [like]).orWhereRaw("lower(s.reference) like ? escape '\\'", [like]),
    );
  }
  const [{ count }] = await q.clone().count<{ count: number | string }[]>({ count: '*' });
  const rows = await q.clone().select(COLUMNS).orderBy(SORTS[query.sort], query.dir).orderBy('a.id', 'asc').limit(query.pageSize).offset((query.page - 1) * query.pageSize);
  return { items: rows.map(toAppliance), total: Number(count), page: query.page, pageSize: query.pageSize };
}

export async function getAppliance(organisationId: string, id: string): Promise<Appliance | null> {
  const row = await base(organisationId).andWhere('a.id', id).select(COLUMNS).first();
  return row ? toAppliance(row) : null;
}

function row(data: ApplianceData) {
  return {
    site_id: data.siteId,
    category: data.category,
    fuel: data.fuel,
    flue_type: data.flueType,
    location: data.location,
    make: data.make,
    model: data.model,
    serial: data.serial,
    rated_input_kw: data.ratedInputKw,
    mfr_ratio_max: data.mfrRatioMax,
    mfr_co_air_free_max_ppm: data.mfrCoAirFreeMaxPpm,
    mfr_co_max_ppm: data.mfrCoMaxPpm,
  };
}

function view(a: ApplianceData | Appliance): Record<string, unknown> {
  return {
    siteId: a.siteId, category: a.category, fuel: a.fuel, flueType: a.flueType, location: a.location, make: a.make, model: a.model, serial: a.serial,
    ratedInputKw: a.ratedInputKw, mfrRatioMax: a.mfrRatioMax, mfrCoAirFreeMaxPpm: a.mfrCoAirFreeMaxPpm, mfrCoMaxPpm: a.mfrCoMaxPpm,
  };
}

async function assertSite(trx: Knex, organisationId: string, siteId: string): Promise<void> {
  const site = await trx('sites').where({ id: siteId, organisation_id: organisationId }).first('id');
  if (!site) throw new AppError('invalid_input', 'Some fields are not valid.', { siteId: 'No such site' });
}

function describe(a: ApplianceData): string {
  return `${a.category.replace(/_/g, ' ')} (${[a.make, a.model].filter(Boolean).join(' ') || 'no make'}) in ${a.location}`;
}

export async function createAppliance(actor: Actor, data: ApplianceData): Promise<Appliance> {
  const id = newId();
  await db().transaction(async (trx) => {
    await assertSite(trx, actor.organisationId, data.siteId);
    const now = new Date().toISOString();
    await trx('appliances').insert({ id, organisation_id: actor.organisationId, ...row(data), active: true, created_at: now, updated_at: now });
    await recordAudit(trx, { actor, entity: 'appliance', entityId: id, action: 'create', summary: `Added ${describe(data)}`, after: view(data) });
  });
  return (await getAppliance(actor.organisationId, id))!;
}

export async function updateAppliance(actor: Actor, id: string, data: ApplianceData): Promise<Appliance | null> {
  const before = await getAppliance(actor.organisationId, id);
  if (!before) return null;
  await db().transaction(async (trx) => {
    await assertSite(trx, actor.organisationId, data.siteId);
    await trx('appliances').where({ id, organisation_id: actor.organisationId }).update({ ...row(data), updated_at: new Date().toISOString() });
    await recordAudit(trx, { actor, entity: 'appliance', entityId: id, action: 'update', summary: `Changed ${describe(data)}`, before: view(before), after: view(data) });
  });
  return getAppliance(actor.organisationId, id);
}

/** Appliances are retired, not deleted: past inspections still point at them. */
export async function retireAppliance(actor: Actor, id: string): Promise<boolean> {
  const before = await getAppliance(actor.organisationId, id);
  if (!before) return false;
  await db().transaction(async (trx) => {
    await trx('appliances').where({ id, organisation_id: actor.organisationId }).update({ active: false, updated_at: new Date().toISOString() });
    await recordAudit(trx, { actor, entity: 'appliance', entityId: id, action: 'retire', summary: `Retired ${describe(before as unknown as ApplianceData)}`, before: { ...view(before), active: true }, after: { active: false } });
  });
  return true;
}

export async function createAppliancesBulk(actor: Actor, rows: ApplianceData[], trx: Knex.Transaction): Promise<string[]> {
  const ids: string[] = [];
  const now = new Date().toISOString();
  for (const data of rows) {
    const id = newId();
    ids.push(id);
    await trx('appliances').insert({ id, organisation_id: actor.organisationId, ...row(data), active: true, created_at: now, updated_at: now });
    await recordAudit(trx, { actor, entity: 'appliance', entityId: id, action: 'import', summary: `Imported ${describe(data)}`, after: view(data) });
  }
  return ids;
}
