import { AppShell } from '@/components/layout/app-shell';
import { requirePageRole } from '@/lib/auth/session';

export default async function PortalLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(['landlord', 'homeowner']);
  return (
    <AppShell user={user} nav={[{ href: '/portal', label: user.role === 'landlord' ? 'My properties' : 'My home' }, { href: '/portal/invoices', label: 'Invoices' }]}>
      {children}
    </AppShell>
  );
}
