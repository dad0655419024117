import 'server-only';
// Sites (properties) of an organisation, seen by the office whole and by customers only where theirs.
import type { Knex } from 'knex';
import { db } from './knex';
import { toIso } from './rows';
import { whereContains } from './search';
import type { SiteData, SiteListQuery } from '@/lib/validations/sites';
import { recordAudit, type Actor as SiteActor } from './audit';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';

export type SiteAudience = { organisationId: string; landlordId?: string; homeownerId?: string };

export type SiteSummary = {
  id: string;
  reference: string;
  addressLine1: string;
  addressLine2: string | null;
  town: string;
  postcode: string;
  jurisdictionId: string;
  jurisdictionName: string;
  landlordId: string | null;
  landlordName: string | null;
  homeownerId: string | null;
  homeownerName: string | null;
  tenantName: string | null;
  applianceCount: number;
  updatedAt: string;
};

export type Page<T> = { items: T[]; total: number; page: number; pageSize: number };

const SORT_COLUMNS: Record<SiteListQuery['sort'], string> = {
  reference: 's.reference',
  address: 's.address_line1',
  town: 's.town',
  postcode: 's.postcode',
  updated: 's.updated_at',
};

function scoped(knex: Knex, audience: SiteAudience) {
  const q = knex('sites as s').where('s.organisation_id', audience.organisationId);
  if (audience.landlordId) q.andWhere('s.landlord_id', audience.landlordId);
  if (audience.homeownerId) q.andWhere('s.homeowner_id', audience.homeownerId);
  return q;
}

function toSummary(r: Record<string, unknown>): SiteSummary {
  return {
    id: String(r.id),
    reference: String(r.reference),
    addressLine1: String(r.address_line1),
    addressLine2: (r.address_line2 as string | null) ?? null,
    town: String(r.town),
    postcode: String(r.postcode),
    jurisdictionId: String(r.jurisdiction_id),
    jurisdictionName: String(r.jurisdiction_name ?? ''),
    landlordId: (r.landlord_id as string | null) ?? null,
    landlordName: (r.landlord_name as string | null) ?? null,
    homeownerId: (r.homeowner_id as string | null) ?? null,
    homeownerName: (r.homeowner_name as string | null) ?? null,
    tenantName: (r.tenant_name as string | null) ?? null,
    applianceCount: Number(r.appliance_count ?? 0),
    updatedAt: toIso(r.updated_at) ?? '',
  };
}

function withDetails(q: Knex.QueryBuilder, knex: Knex) {
  return q
    .leftJoin('jurisdictions as j', 'j.id', 's.jurisdiction_id')
    .leftJoin('users as l', 'l.id', 's.landlord_id')
    .leftJoin('users as h', 'h.id', 's.homeowner_id')
    .select(
      's.id', 's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode', 's.jurisdiction_id', 's.landlord_id', 's.homeowner_id',
      's.tenant_name', 's.updated_at',
      'j.name as jurisdiction_name', 'l.name as landlord_name', 'h.name as homeowner_name',
      knex('appliances as a').count('*').whereRaw('a.site_id = s.id').andWhere('a.active', true).as('appliance_count'),
    );
}

export async function listSites(audience: SiteAudience, query: SiteListQuery): Promise<Page<SiteSummary>> {
  const knex = db();
  const base = scoped(knex, audience);
  // whereContains adds ESCAPE '\': without it SQLite reads the backslashes literally and a search for "50%" finds nothing.
  if (query.q) whereContains(base, ['s.search_text'], query.q);
  if (query.jurisdictionId) base.andWhere('s.jurisdiction_id', query.jurisdictionId);
  if (query.customerId) base.andWhere((w) => w.where('s.landlord_id', query.customerId!).orWhere('s.homeowner_id', query.customerId!));
  const [{ count }] = await base.clone().count<{ count: number | string }[]>({ count: '*' });
  const rows = await withDetails(base.clone(), knex)
    .orderBy(SORT_COLUMNS[query.sort], query.dir)
    .orderBy('s.id', 'asc')
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { items: rows.map(toSummary), total: Number(count), page: query.page, pageSize: query.pageSize };
}

/** One site, or null when it is not in the audience's reach (callers answer 404 either way). */
export async function getSite(audience: SiteAudience, id: string): Promise<SiteSummary | null> {
  const knex = db();
  const row = await withDetails(scoped(knex, audience).andWhere('s.id', id), knex).first();
  return row ? toSummary(row) : null;
}

// ---- Office register: full site record, writes (audited), pickers and no-access history ----

export type SiteDetail = SiteSummary & {
  tenantEmail: string | null;
  tenantPhone: string | null;
  accessNotes: string | null;
};


function siteRow(data: SiteData) {
  return {
    reference: data.reference,
    address_line1: data.addressLine1,
    address_line2: data.addressLine2,
    town: data.town,
    postcode: data.postcode,
    jurisdiction_id: data.jurisdictionId,
    landlord_id: data.landlordId,
    homeowner_id: data.homeownerId,
    tenant_name: data.tenantName,
    tenant_email: data.tenantEmail,
    tenant_phone: data.tenantPhone,
    access_notes: data.accessNotes,
    search_text: [data.addressLine1, data.addressLine2, data.town, data.postcode, data.reference].filter(Boolean).join(' ').toLowerCase(),
  };
}

function siteAuditView(data: SiteData | SiteDetail): Record<string, unknown> {
  return {
    reference: data.reference, addressLine1: data.addressLine1, addressLine2: data.addressLine2, town: data.town, postcode: data.postcode,
    jurisdictionId: data.jurisdictionId, landlordId: data.landlordId, homeownerId: data.homeownerId,
    tenantName: data.tenantName, tenantEmail: data.tenantEmail, tenantPhone: data.tenantPhone, accessNotes: data.accessNotes,
  };
}

export async function getSiteDetail(organisationId: string, id: string): Promise<SiteDetail | null> {
  const knex = db();
  const row = await withDetails(scoped(knex, { organisationId }).andWhere('s.id', id), knex)
    .select('s.tenant_email', 's.tenant_phone', 's.access_notes')
    .first();
  if (!row) return null;
  return { ...toSummary(row), tenantEmail: row.tenant_email ?? null, tenantPhone: row.tenant_phone ?? null, accessNotes: row.access_notes ?? null };
}

/**
 * Checks that the jurisdiction and customers named by a site belong to the organisation; a foreign
 * id reads as "not found" in the field that named it, never as someone else's record.
 */
export async function checkSiteReferences(organisationId: string, data: Pick<SiteData, 'jurisdictionId' | 'landlordId' | 'homeownerId'>, trx: Knex = db()): Promise<Record<string, string>> {
  const fields: Record<string, string> = {};
  const j = await trx('jurisdictions').where({ id: data.jurisdictionId, organisation_id: organisationId }).first('id');
  if (!j) fields.jurisdictionId = 'No such jurisdiction';
  for (const [key, role] of [['landlordId', 'landlord'], ['homeownerId', 'homeowner']] as const) {
    const id = data[key];
    if (!id) continue;
    const u = await trx('users').where({ id, organisation_id: organisationId, role }).first('id');
    if (!u) fields[key] = `No such ${role}`;
  }
  return fields;
}

async function referenceTaken(trx: Knex, organisationId: string, reference: string, exceptId?: string): Promise<boolean> {
  const q = trx('sites').where({ organisation_id: organisationId, reference });
  if (exceptId) q.whereNot({ id: exceptId });
  return Boolean(await q.first('id'));
}

export async function createSite(actor: SiteActor, data: SiteData): Promise<SiteDetail> {
  const fields = await checkSiteReferences(actor.organisationId, data);
  if (Object.keys(fields).length) throw new AppError('invalid_input', 'Some fields are not valid.', fields);
  const id = newId();
  await db().transaction(async (trx) => {
    if (await referenceTaken(trx, actor.organisationId, data.reference)) throw new AppError('conflict', 'Another site already has this reference.', { reference: 'Another site already has this reference' });
    const now = new Date().toISOString();
    await trx('sites').insert({ id, organisation_id: actor.organisationId, ...siteRow(data), created_at: now, updated_at: now });
    await recordAudit(trx, { actor, entity: 'site', entityId: id, action: 'create', summary: `Added site ${data.reference}, ${data.addressLine1}, ${data.town}`, after: siteAuditView(data) });
  });
  return (await getSiteDetail(actor.organisationId, id))!;
}

export async function updateSite(actor: SiteActor, id: string, data: SiteData): Promise<SiteDetail | null> {
  const before = await getSiteDetail(actor.organisationId, id);
  if (!before) return null;
  const fields = await checkSiteReferences(actor.organisationId, data);
  if (Object.keys(fields).length) throw new AppError('invalid_input', 'Some fields are not valid.', fields);
  await db().transaction(async (trx) => {
    if (await referenceTaken(trx, actor.organisationId, data.reference, id)) throw new AppError('conflict', 'Another site already has this reference.', { reference: 'Another site already has this reference' });
    await trx('sites').where({ id, organisation_id: actor.organisationId }).update({ ...siteRow(data), updated_at: new Date().toISOString() });
    await recordAudit(trx, { actor, entity: 'site', entityId: id, action: 'update', summary: `Changed site ${data.reference}, ${data.addressLine1}, ${data.town}`, before: siteAuditView(before), after: siteAuditView(data) });
  });
  return getSiteDetail(actor.organisationId, id);
}

/** Inserts many sites in one transaction: all are written or none (CSV import). */
export async function createSitesBulk(actor: SiteActor, rows: SiteData[], trx: Knex.Transaction): Promise<string[]> {
  const ids: string[] = [];
  const now = new Date().toISOString();
  for (const data of rows) {
    const id = newId();
    ids.push(id);
    await trx('sites').insert({ id, organisation_id: actor.organisationId, ...siteRow(data), created_at: now, updated_at: now });
    await recordAudit(trx, { actor, entity: 'site', entityId: id, action: 'import', summary: `Imported site ${data.reference}, ${data.addressLine1}, ${data.town}`, after: siteAuditView(data) });
  }
  return ids;
}

/** Site references already used by the organisation, for the import preview. */
export async function siteIdsByReference(organisationId: string): Promise<Map<string, string>> {
  const rows = await db()('sites').where({ organisation_id: organisationId }).select('id', 'reference');
  return new Map(rows.map((r: Record<string, unknown>) => [String(r.reference).toLowerCase(), String(r.id)]));
}

export async function listJurisdictionOptions(organisationId: string): Promise<Array<{ id: string; name: string }>> {
  const rows = await db()('jurisdictions').where({ organisation_id: organisationId }).select('id', 'name').orderBy('name');
  return rows.map((r: Record<string, unknown>) => ({ id: String(r.id), name: String(r.name) }));
}

export type NoAccessAttempt = { visitId: string; at: string; note: string | null; engineerName: string | null; windowStart: string };

/** Every failed attempt to get in, newest first: landlords rely on this record. */
export async function listNoAccessAttempts(organisationId: string, siteId: string): Promise<NoAccessAttempt[]> {
  const rows = await db()('visits as v')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .where({ 'v.organisation_id': organisationId, 'v.site_id': siteId, 'v.status': 'no_access' })
    .select('v.id', 'v.no_access_at', 'v.no_access_note', 'v.window_start', 'u.name as engineer_name')
    .orderBy('v.no_access_at', 'desc');
  return rows.map((r: Record<string, unknown>) => ({
    visitId: String(r.id),
    at: toIso(r.no_access_at) ?? toIso(r.window_start) ?? '',
    note: (r.no_access_note as string | null) ?? null,
    engineerName: (r.engineer_name as string | null) ?? null,
    windowStart: toIso(r.window_start) ?? '',
  }));
}
