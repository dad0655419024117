import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { AuditTable } from './_components/audit-table';

export const metadata: Metadata = { title: 'Audit log' };

export default async function AuditPage() {
  await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Audit log</h1>
      <p className="text-sm text-ink-soft">Every change to customers, sites, appliances, bookings, analysers and accounts: who, what, when, and the values before and after.</p>
      <AuditTable />
    </div>
  );
}
