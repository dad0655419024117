import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/session';
import { UsersTable } from './_components/users-table';
import { InviteForm } from './_components/invite-form';

export const metadata: Metadata = { title: 'Staff and accounts' };

export default async function UsersPage() {
  const user = await requirePageRole(['office']);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Staff and accounts</h1>
      <p className="text-sm text-ink-soft">Deactivating someone or changing their role signs them out everywhere at once.</p>
      <InviteForm />
      <UsersTable selfId={user.id} />
    </div>
  );
}
