import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { getOrganisationTimeZone, listEngineers } from '@/db/schedule';
import { dateInZone } from '@/lib/renewals/dates';
import { Board } from '../_components/board';
import { CalendarFeeds } from '../_components/calendar-feeds';

export const metadata: Metadata = { title: 'Board' };
export const dynamic = 'force-dynamic';

export default async function BoardPage() {
  const user = await requirePageRole(['office']);
  const [timeZone, engineers] = await Promise.all([getOrganisationTimeZone(user.organisationId), listEngineers(user.organisationId)]);
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Scheduling board</h1>
      <Board today={dateInZone(new Date(), timeZone)} engineers={engineers} />
      <CalendarFeeds engineers={engineers} />
    </div>
  );
}
