import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { SITE_COLUMNS, APPLIANCE_COLUMNS } from '@/lib/csv/import';
import { ImportForm } from '../_components/import-form';

export const metadata: Metadata = { title: 'Import CSV' };

export default async function ImportPage() {
  await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Import sites or appliances</h1>
      <p className="text-sm text-ink-soft">Check the file first: every problem is listed by row and column and nothing is written. Import writes every row, or none if anything is wrong.</p>
      <ImportForm columns={{ sites: [...SITE_COLUMNS], appliances: [...APPLIANCE_COLUMNS] }} />
    </div>
  );
}
