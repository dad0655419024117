import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { ButtonLink } from '@/components/ui/button';
import { CustomersTable } from './_components/customers-table';

export const metadata: Metadata = { title: 'Customers' };

export default async function CustomersPage() {
  await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-bold">Landlords and homeowners</h1>
        <ButtonLink href="/office/customers/new" className="ml-auto">Add customer</ButtonLink>
      </div>
      <CustomersTable />
    </div>
  );
}
