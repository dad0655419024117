import { AppShell } from '@/components/layout/app-shell';
import { requirePageRole } from '@/lib/auth/session';

export default async function FieldLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(['engineer']);
  return (
    <AppShell user={user} nav={[{ href: '/field', label: 'My visits' }]}>
      {children}
    </AppShell>
  );
}
