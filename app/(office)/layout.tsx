import { AppShell } from '@/components/layout/app-shell';
import { requirePageRole } from '@/lib/auth/session';
import { env } from '@/lib/env';

export default async function OfficeLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(['office']);
  const nav = [
    { href: '/office', label: 'Overview' },
    { href: '/office/dashboard', label: 'Dashboard' },
    { href: '/office/board', label: 'Board' },
    { href: '/office/review', label: 'Review' },
    { href: '/office/certificates', label: 'Certificates' },
    { href: '/office/sites', label: 'Sites' },
    { href: '/office/invoices', label: 'Invoices' },
    { href: '/office/customers', label: 'Customers' },
    { href: '/office/renewals', label: 'Renewals' },
    { href: '/office/analysers', label: 'Analysers' },
    { href: '/office/users', label: 'Staff' },
    { href: '/office/audit', label: 'Audit log' },
    { href: '/office/limits', label: 'Limits' },
    ...(env().MAIL_FAKE_URL ? [{ href: '/office/mailbox', label: 'Test mailbox' }] : []),
  ];
  return (
    <AppShell user={user} nav={nav} wide>
      {children}
    </AppShell>
  );
}
