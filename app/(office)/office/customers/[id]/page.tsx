import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getCustomer } from '@/db/customers';
import { CustomerForm } from '../_components/customer-form';

export const metadata: Metadata = { title: 'Customer' };

export default async function CustomerPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const customer = await getCustomer(user.organisationId, id);
  if (!customer) notFound();
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">{customer.name}</h1>
      <p className="text-sm">
        <Link className="text-copper underline underline-offset-4" href={`/office/sites?customerId=${customer.id}`}>
          {customer.siteCount} site{customer.siteCount === 1 ? '' : 's'}
        </Link>
      </p>
      <CustomerForm id={customer.id} initial={{ role: customer.role, name: customer.name, email: customer.email, phone: customer.phone ?? '' }} />
    </div>
  );
}
