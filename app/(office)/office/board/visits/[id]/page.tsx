import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getOrganisationTimeZone, getVisit, listEngineers, listOpenFindings, listSiteChoices } from '@/db/schedule';
import { utcToZoned } from '@/lib/schedule/zoned';
import { VISIT_STATUS_LABELS } from '@/lib/schedule/lifecycle';
import { VISIT_KIND_LABELS, type VisitKind } from '@/lib/validations/visits';
import { dateInZone } from '@/lib/renewals/dates';
import { VisitForm } from '../../_components/visit-form';
import { VisitActions } from '../../_components/visit-actions';

export const metadata: Metadata = { title: 'Visit' };

export default async function VisitPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const visit = await getVisit(user.organisationId, id);
  if (!visit) notFound();
  const [timeZone, engineers, sites, findings] = await Promise.all([
    getOrganisationTimeZone(user.organisationId), listEngineers(user.organisationId), listSiteChoices(user.organisationId), listOpenFindings(user.organisationId, id),
  ]);
  const start = utcToZoned(visit.windowStart, timeZone);
  const end = utcToZoned(visit.windowEnd, timeZone);
  return (
    <div className="flex flex-col gap-4">
      <p><Link href="/office/board" className="text-sm text-copper underline underline-offset-4">← Board</Link></p>
      <h1 className="text-2xl font-bold">{VISIT_KIND_LABELS[visit.kind as VisitKind] ?? visit.kind} at {visit.siteReference}</h1>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="font-semibold">Status</dt><dd data-testid="visit-status">{VISIT_STATUS_LABELS[visit.status]}</dd>
        <dt className="font-semibold">When</dt><dd>{start.date} {start.time}–{end.time}</dd>
        <dt className="font-semibold">Site</dt><dd><Link className="text-copper underline" href={`/office/sites/${visit.siteId}`}>{visit.address}, {visit.town} {visit.postcode}</Link></dd>
        <dt className="font-semibold">Engineer</dt><dd>{visit.engineerName ?? 'Unassigned'}</dd>
        {visit.noAccessAt ? (<><dt className="font-semibold">No access</dt><dd>{new Date(visit.noAccessAt).toLocaleString('en-GB', { timeZone })} — {visit.noAccessNote}</dd></>) : null}
        {visit.cancelReason ? (<><dt className="font-semibold">Cancelled</dt><dd>{visit.cancelReason}</dd></>) : null}
        {visit.followUpOf ? (<><dt className="font-semibold">Follows</dt><dd><Link className="text-copper underline" href={`/office/board/visits/${visit.followUpOf}`}>earlier visit</Link></dd></>) : null}
      </dl>
      {visit.status === 'booked' ? (
        <section aria-labelledby="edit-title" className="flex flex-col gap-2">
          <h2 id="edit-title" className="text-lg font-bold">Change the booking</h2>
          <VisitForm id={visit.id} sites={sites} engineers={engineers} initial={{ siteId: visit.siteId, engineerId: visit.engineerId ?? '', kind: visit.kind as VisitKind, date: start.date, startTime: start.time, endTime: end.time, notes: visit.notes ?? '' }} />
        </section>
      ) : null}
      <VisitActions visitId={visit.id} status={visit.status} findings={findings} engineers={engineers} today={dateInZone(new Date(), timeZone)} />
    </div>
  );
}
