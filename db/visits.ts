import 'server-only';
// Visits: booked attendances at a site, and their state.
import { db } from './knex';
import { toIso } from './rows';

export const VISIT_STATUSES = ['booked', 'on_site', 'submitted', 'certified', 'no_access', 'cancelled'] as const;
export type VisitStatus = (typeof VISIT_STATUSES)[number];

export type VisitSummary = {
  id: string;
  siteId: string;
  siteReference: string;
  address: string;
  town: string;
  postcode: string;
  engineerId: string | null;
  engineerName: string | null;
  kind: string;
  status: VisitStatus;
  windowStart: string;
  windowEnd: string;
  notes: string | null;
  accessNotes: string | null;
};

/** The fields every visit listing shares (visit joined to its site and engineer); the board adds its own. */
export function visitCoreFromRow(r: Record<string, unknown>): Omit<VisitSummary, 'accessNotes'> {
  return {
    id: String(r.id),
    siteId: String(r.site_id),
    siteReference: String(r.reference),
    address: [r.address_line1, r.address_line2].filter(Boolean).join(', '),
    town: String(r.town),
    postcode: String(r.postcode),
    engineerId: (r.engineer_id as string | null) ?? null,
    engineerName: (r.engineer_name as string | null) ?? null,
    kind: String(r.kind),
    status: r.status as VisitStatus,
    windowStart: toIso(r.window_start) ?? '',
    windowEnd: toIso(r.window_end) ?? '',
    notes: (r.notes as string | null) ?? null,
  };
}

function toSummary(r: Record<string, unknown>): VisitSummary {
  return { ...visitCoreFromRow(r), accessNotes: (r.access_notes as string | null) ?? null };
}

/** An engineer's visits in a time range, earliest first. */
export async function listEngineerVisits(input: { organisationId: string; engineerId: string; fromIso: string; toIso: string }): Promise<VisitSummary[]> {
  const rows = await db()('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .leftJoin('users as u', 'u.id', 'v.engineer_id')
    .where({ 'v.organisation_id': input.organisationId, 'v.engineer_id': input.engineerId })
    .andWhere('v.window_start', '>=', input.fromIso)
    .andWhere('v.window_start', '<', input.toIso)
    .select('v.*', 's.reference', 's.address_line1', 's.address_line2', 's.town', 's.postcode', 's.access_notes', 'u.name as engineer_name')
    .orderBy('v.window_start', 'asc');
  return rows.map(toSummary);
}
