import { AppShell } from '@/components/layout/app-shell';
import { requirePageRole } from '@/lib/auth/session';
import { FieldProvider } from './_components/field-provider';
import { ServiceWorkerRegistration } from './_components/service-worker';

// The engineer's area. The session check lives here rather than in the (field) group layout so
// that the group's offline page (/offline) can be built without one and precached by the worker.
export default async function FieldLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageRole(['engineer']);
  return (
    <AppShell user={user} nav={[{ href: '/field', label: 'My visits' }]}>
      <FieldProvider userId={user.id}>
        <ServiceWorkerRegistration />
        {children}
      </FieldProvider>
    </AppShell>
  );
}
