import 'server-only';
// Sites (properties) of an organisation, seen by the office whole and by customers only where theirs.
import type { Knex } from 'knex';
import { db } from './knex';
import { toIso } from './rows';
import type { SiteListQuery } from '@/lib/validations/sites';

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
  if (query.q) base.andWhere('s.search_text', 'like', `%${query.q.toLowerCase().replace(/[%_\\]/g, (c) => `\\${c}`)}%`);
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
