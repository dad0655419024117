import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { listJurisdictionOptions } from '@/db/sites';
import { ButtonLink } from '@/components/ui/button';
import { SitesTable } from './_components/sites-table';

export const metadata: Metadata = { title: 'Sites' };

export default async function SitesPage({ searchParams }: { searchParams: Promise<{ customerId?: string }> }) {
  const user = await requirePageRole(['office']);
  const { customerId } = await searchParams;
  const jurisdictions = await listJurisdictionOptions(user.organisationId);
  const validCustomer = customerId && /^[0-9a-f-]{36}$/i.test(customerId) ? customerId : undefined;
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">Sites</h1>
        <ButtonLink href="/office/sites/appliances" variant="secondary">All appliances</ButtonLink>
        <ButtonLink href="/office/sites/import" variant="secondary">Import CSV</ButtonLink>
        <ButtonLink href="/office/sites/new">Add site</ButtonLink>
      </div>
      <SitesTable jurisdictions={jurisdictions} customerId={validCustomer} />
    </div>
  );
}
