import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';

export const metadata: Metadata = { title: 'Office' };

export default async function OfficeHome() {
  const user = await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Good to see you, {user.name.split(' ')[0]}</h1>
      <ul className="grid gap-3 sm:grid-cols-2">
        <li>
          <Link href="/office/sites" className="block rounded-xl border border-line bg-card p-4 shadow-sm hover:border-copper">
            <span className="font-bold">Sites</span>
            <span className="block text-sm text-ink-soft">Every property you look after, with its landlord or homeowner.</span>
          </Link>
        </li>
      </ul>
    </div>
  );
}
