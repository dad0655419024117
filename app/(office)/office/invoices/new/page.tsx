import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { listBillableVisits } from '@/db/invoices';
import { getPriceList } from '@/db/prices';
import { Alert } from '@/components/ui/alert';
import { RaiseInvoiceForm } from '../_components/raise-invoice-form';

export const metadata: Metadata = { title: 'Raise an invoice' };

export default async function RaiseInvoicePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePageRole(['office']);
  const { visit } = await searchParams;
  const [visits, priceList] = await Promise.all([listBillableVisits(user.organisationId), getPriceList(user.organisationId)]);
  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm">
        <Link href="/office/invoices" className="text-copper underline underline-offset-4">
          Invoices
        </Link>
      </p>
      <h1 className="text-2xl font-bold">Raise an invoice</h1>
      {visits.length === 0 ? (
        <Alert title="No visit is waiting for an invoice">Visits appear here once their work is submitted or certified, until they are invoiced.</Alert>
      ) : (
        <RaiseInvoiceForm visits={visits} priceList={priceList} initialVisitId={typeof visit === 'string' ? visit : undefined} />
      )}
    </div>
  );
}
