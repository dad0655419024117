import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { getOrganisationTimeZone, listEngineers, listSiteChoices } from '@/db/schedule';
import { dateInZone } from '@/lib/renewals/dates';
import { VisitForm } from '../_components/visit-form';

export const metadata: Metadata = { title: 'Book a visit' };

export default async function NewVisitPage({ searchParams }: { searchParams: Promise<{ date?: string; siteId?: string }> }) {
  const user = await requirePageRole(['office']);
  const sp = await searchParams;
  const [timeZone, engineers, sites] = await Promise.all([getOrganisationTimeZone(user.organisationId), listEngineers(user.organisationId), listSiteChoices(user.organisationId)]);
  const date = sp.date && /^\d{4}-\d{2}-\d{2}$/.test(sp.date) ? sp.date : dateInZone(new Date(), timeZone);
  const siteId = sites.some((s) => s.id === sp.siteId) ? sp.siteId! : '';
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Book a visit</h1>
      <p className="text-sm text-ink-soft">Times are in {timeZone.replace('_', ' ')} time. The engineer sees the visit on their phone at the next sync.</p>
      <VisitForm initial={{ siteId, engineerId: '', kind: 'annual_check', date, startTime: '09:00', endTime: '11:00', notes: '' }} sites={sites} engineers={engineers} />
    </div>
  );
}
