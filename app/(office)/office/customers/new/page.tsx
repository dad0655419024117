import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { CustomerForm } from '../_components/customer-form';

export const metadata: Metadata = { title: 'Add customer' };

export default async function NewCustomerPage() {
  await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Add a landlord or homeowner</h1>
      <CustomerForm />
    </div>
  );
}
