import { AppShell } from '@/components/layout/app-shell';
import { requirePageRole } from '@/lib/auth/session';
import { env } from '@/lib/env';

export default async function OfficeLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(['office']);
  const nav = [
    { href: '/office', label: 'Overview' },
    { href: '/office/sites', label: 'Sites' },
    { href: '/office/limits', label: 'Limits' },
    ...(env().MAIL_FAKE_URL ? [{ href: '/office/mailbox', label: 'Test mailbox' }] : []),
  ];
  return (
    <AppShell user={user} nav={nav} wide>
      {children}
    </AppShell>
  );
}
