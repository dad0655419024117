import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { PortalSites } from './_components/portal-sites';

export const metadata: Metadata = { title: 'My properties' };

export default async function PortalHome() {
  const user = await requirePageRole(['landlord', 'homeowner']);
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-2xl font-bold">{user.role === 'landlord' ? 'My properties' : 'My home'}</h1>
      <PortalSites />
    </div>
  );
}
