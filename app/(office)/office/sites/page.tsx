import type { Metadata } from 'next';
import { SitesTable } from './_components/sites-table';

export const metadata: Metadata = { title: 'Sites' };

export default function SitesPage() {
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Sites</h1>
      <SitesTable />
    </div>
  );
}
