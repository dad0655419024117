import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { AppliancesTable } from '../_components/appliances-table';

export const metadata: Metadata = { title: 'Appliances' };

export default async function AppliancesPage() {
  await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">All appliances</h1>
      <AppliancesTable />
    </div>
  );
}
