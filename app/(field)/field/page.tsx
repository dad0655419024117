import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { db } from '@/db/knex';
import { getOrganisationTimeZone, listFieldVisits } from '@/db/inspections';
import type { FieldVisit } from '@/lib/field';
import { MyVisits, type VisitSummary } from './_components/my-visits';

export const metadata: Metadata = { title: 'My visits' };

const DAYS_AHEAD = 14;

/** Only what a card shows goes to the page (the appliances and their history stay on the server). */
function toVisitSummary(v: FieldVisit): VisitSummary {
  const { id, status, kind, windowStart, windowEnd } = v;
  const { address, town, postcode, reference, accessNotes } = v.site;
  return { id, status, kind, windowStart, windowEnd, site: { address, town, postcode, reference, accessNotes }, applianceCount: v.appliances.length };
}

// The list is drawn on the server from the database, so it paints before any script runs; on the
// phone the saved copy (IndexedDB) and /api/v1/field/visits then take over, and the service
// worker's copy of this page opens offline.
export default async function FieldHome() {
  const user = await requirePageRole(['engineer']);
  const start = new Date();
  start.setUTCHours(0, 0, 0, 0);
  const [visits, timeZone] = await Promise.all([
    listFieldVisits({ organisationId: user.organisationId, engineerId: user.id, fromIso: start.toISOString(), toIso: new Date(start.getTime() + DAYS_AHEAD * 86400_000).toISOString() }),
    getOrganisationTimeZone(db(), user.organisationId),
  ]);
  return <MyVisits initial={{ visits: visits.map(toVisitSummary), timeZone }} />;
}
