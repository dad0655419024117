import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { invoiceAudience } from '@/lib/billing/audience';
import { getInvoice } from '@/db/invoices';
import { PortalInvoice } from '../_components/portal-invoice';

export const metadata: Metadata = { title: 'Invoice' };

export default async function PortalInvoicePage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePageRole(['landlord', 'homeowner']);
  const { id } = await params;
  const { checkout } = await searchParams;
  // Someone else's invoice looks exactly like one that does not exist.
  const invoice = await getInvoice(invoiceAudience(user), id);
  if (!invoice) notFound();
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm">
        <Link href="/portal/invoices" className="text-copper underline underline-offset-4">
          My invoices
        </Link>
      </p>
      <PortalInvoice initial={invoice} checkout={checkout === 'done' || checkout === 'cancelled' ? checkout : null} />
    </div>
  );
}
