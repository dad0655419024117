import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { listJurisdictionOptions } from '@/db/sites';
import { listCustomerOptions } from '@/db/customers';
import { SiteForm } from '../_components/site-form';

export const metadata: Metadata = { title: 'Add site' };

export default async function NewSitePage() {
  const user = await requirePageRole(['office']);
  const [jurisdictions, customers] = await Promise.all([listJurisdictionOptions(user.organisationId), listCustomerOptions(user.organisationId)]);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Add a site</h1>
      <SiteForm jurisdictions={jurisdictions} landlords={customers.filter((c) => c.role === 'landlord')} homeowners={customers.filter((c) => c.role === 'homeowner')} />
    </div>
  );
}
