import 'server-only';
// "Book my renewal": a landlord's or homeowner's request for the next check, waiting in the
// office's queue until someone books the visit and closes it. One open request per site.
import { db } from './knex';
import { toIso } from './rows';
import type { SiteAudience } from './sites';
import { newId } from '@/lib/ids';
import { AppError } from '@/lib/errors';

type Row = Record<string, unknown>;

export type RenewalRequest = {
  id: string;
  siteId: string;
  siteReference: string;
  address: string;
  town: string;
  requestedByName: string | null;
  note: string | null;
  preferredTimes: string | null;
  status: 'open' | 'done';
  createdAt: string;
};

function toRequest(r: Row): RenewalRequest {
  return {
    id: String(r.id),
    siteId: String(r.site_id),
    siteReference: String(r.reference),
    address: [r.address_line1, r.address_line2].filter(Boolean).join(', '),
    town: String(r.town),
    requestedByName: (r.requested_by_name as string | null) ?? null,
    note: (r.note as string | null) ?? null,
    preferredTimes: (r.preferred_times as string | null) ?? null,
    status: r.status as 'open' | 'done',
    createdAt: toIso(r.created_at) ?? '',
  };
}

function base(audience: SiteAudience) {
  const q = db()('renewal_requests as r')
    .join('sites as s', 's.id', 'r.site_id')
    .leftJoin('users as u', 'u.id', 'r.requested_by')
    .where('r.organisation_id', audience.organisationId)
    .select('r.*', 's.reference', 's.address_line1', 's.address_line2', 's.town', 'u.name as requested_by_name');
  if (audience.landlordId) q.andWhere('s.landlord_id', audience.landlordId);
  if (audience.homeownerId) q.andWhere('s.homeowner_id', audience.homeownerId);
  return q;
}

/** A customer asks for the next check of one of their own sites; 404 for any other site. */
export async function createRenewalRequest(input: { audience: SiteAudience; userId: string; siteId: string; note: string | null; preferredTimes: string | null }): Promise<{ request: RenewalRequest; created: boolean }> {
  const { audience } = input;
  const site = db()('sites').where({ id: input.siteId, organisation_id: audience.organisationId });
  if (audience.landlordId) site.andWhere('landlord_id', audience.landlordId);
  if (audience.homeownerId) site.andWhere('homeowner_id', audience.homeownerId);
  if (!(await site.first('id'))) throw new AppError('not_found', 'No such property.');
  const open: Row | undefined = await base(audience).andWhere({ 'r.site_id': input.siteId, 'r.status': 'open' }).first();
  if (open) return { request: toRequest(open), created: false };
  const id = newId();
  await db()('renewal_requests').insert({
    id,
    organisation_id: audience.organisationId,
    site_id: input.siteId,
    requested_by: input.userId,
    note: input.note,
    preferred_times: input.preferredTimes,
    status: 'open',
    created_at: new Date().toISOString(),
  });
  return { request: toRequest(await base(audience).andWhere('r.id', id).first()), created: true };
}

export async function listRenewalRequests(audience: SiteAudience, filter: { status?: 'open' | 'done'; siteId?: string } = {}): Promise<RenewalRequest[]> {
  const q = base(audience);
  if (filter.status) q.andWhere('r.status', filter.status);
  if (filter.siteId) q.andWhere('r.site_id', filter.siteId);
  const rows: Row[] = await q.orderBy('r.created_at', 'asc');
  return rows.map(toRequest);
}

/** The office marks a request done once the visit is booked; 409 when it is already closed. */
export async function closeRenewalRequest(input: { organisationId: string; id: string; userId: string }): Promise<void> {
  const exists: Row | undefined = await db()('renewal_requests').where({ id: input.id, organisation_id: input.organisationId }).first('status');
  if (!exists) throw new AppError('not_found', 'No such request.');
  const changed = await db()('renewal_requests').where({ id: input.id, organisation_id: input.organisationId, status: 'open' }).update({ status: 'done', closed_at: new Date().toISOString(), closed_by: input.userId });
  if (changed !== 1) throw new AppError('conflict', 'This request is already closed.');
}
