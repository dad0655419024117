import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { ButtonLink } from '@/components/ui/button';
import { InvoicesTable } from '../_components/invoices-table';

export const metadata: Metadata = { title: 'Invoices' };

export default async function InvoicesPage() {
  await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-bold">Invoices</h1>
        <Link href="/office/prices" className="inline-flex min-h-11 items-center text-sm font-semibold text-copper underline underline-offset-4">
          Prices and tax
        </Link>
        <ButtonLink href="/office/invoices/new" className="ml-auto">
          Raise an invoice
        </ButtonLink>
      </div>
      <InvoicesTable />
    </div>
  );
}
