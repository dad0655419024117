import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { ButtonLink } from '@/components/ui/button';
import { AnalysersTable } from './_components/analysers-table';

export const metadata: Metadata = { title: 'Analysers' };

export default async function AnalysersPage() {
  await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="mr-auto text-2xl font-bold">Analysers</h1>
        <ButtonLink href="/office/analysers/new">Add analyser</ButtonLink>
      </div>
      <p className="text-sm text-ink-soft">Flagged “due soon” within 30 days of the calibration date (configured policy). An engineer who uses an overdue analyser must give a reason; it is shown here and at review.</p>
      <AnalysersTable />
    </div>
  );
}
