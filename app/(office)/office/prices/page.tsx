import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { getPriceList } from '@/db/prices';
import { PriceListForm } from './_components/price-list-form';

export const metadata: Metadata = { title: 'Prices and tax' };

export default async function PricesPage() {
  const user = await requirePageRole(['office']);
  const list = await getPriceList(user.organisationId);
  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm">
        <Link href="/office/invoices" className="text-copper underline underline-offset-4">
          Invoices
        </Link>
      </p>
      <h1 className="text-2xl font-bold">Prices and tax</h1>
      <p className="max-w-2xl text-sm text-ink-soft">
        Prices are before tax, in {list.settings.currency}. New invoices use them; invoices already raised keep the prices they were raised with.
      </p>
      <PriceListForm initial={list} />
    </div>
  );
}
