import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { getReminderSettings } from '@/db/reminders';
import { RenewalsTable } from './_components/renewals-table';
import { ReminderPanel } from './_components/reminder-panel';

export const metadata: Metadata = { title: 'Renewals' };
export const dynamic = 'force-dynamic';

export default async function RenewalsPage() {
  const user = await requirePageRole(['office']);
  const settings = await getReminderSettings(user.organisationId);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Renewals</h1>
      <p className="text-sm text-ink-soft">
        Each certificate runs for its jurisdiction’s period; a check inside the early-renewal window keeps the old anniversary. Due soon means within {Math.max(...settings.offsetsDays)} days.
      </p>
      <RenewalsTable />
      <ReminderPanel offsetsDays={settings.offsetsDays} />
    </div>
  );
}
