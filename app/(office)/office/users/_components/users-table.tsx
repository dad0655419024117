'use client';
// Staff and customer accounts; staff can be re-roled or deactivated here (customers under Customers).
import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { useSWRConfig } from 'swr';
import type { StaffUser } from '@/db/staff';
import { ROLE_LABELS } from '@/lib/auth/roles';
import { fetchJson } from '@/lib/fetch-json';
import { Alert } from '@/components/ui/alert';
import { DataTable, FilterSelect } from '../../_components/data-table';

function Actions({ user, selfId, onDone }: { user: StaffUser; selfId: string; onDone: (msg: string, tone: 'success' | 'error') => void }) {
  const { mutate } = useSWRConfig();
  if (user.id === selfId || (user.role !== 'engineer' && user.role !== 'office')) return <span className="text-ink-soft">—</span>;
  async function change(body: Record<string, unknown>, msg: string) {
    try {
      await fetchJson(`/api/v1/users/${user.id}`, { method: 'PATCH', body: JSON.stringify(body) });
      onDone(msg, 'success');
      await mutate((key) => typeof key === 'string' && key.startsWith('/api/v1/users'));
    } catch (err) {
      onDone((err as Error).message, 'error');
    }
  }
  return (
    <div className="flex flex-wrap gap-1">
      <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 text-sm font-semibold" onClick={() => change({ role: user.role === 'engineer' ? 'office' : 'engineer' }, `${user.name} is now ${user.role === 'engineer' ? 'office' : 'an engineer'}.`)}>
        Make {user.role === 'engineer' ? 'office' : 'engineer'}
      </button>
      <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 text-sm font-semibold" onClick={() => change({ active: !user.active }, user.active ? `${user.name} is deactivated and signed out everywhere.` : `${user.name} can sign in again.`)}>
        {user.active ? 'Deactivate' : 'Reactivate'}
      </button>
    </div>
  );
}

export function UsersTable({ selfId }: { selfId: string }) {
  const [role, setRole] = useState('');
  const [message, setMessage] = useState<{ text: string; tone: 'success' | 'error' } | null>(null);
  const col = createColumnHelper<StaffUser>();
  const columns = [
    col.accessor('name', { header: 'Name', meta: { sort: 'name' } }),
    col.accessor('email', { header: 'E-mail', meta: { sort: 'email' } }),
    col.accessor('role', { header: 'Role', meta: { sort: 'role' }, cell: (c) => ROLE_LABELS[c.getValue()] }),
    col.accessor('active', { header: 'State', meta: { sort: 'active' }, cell: (c) => (c.getValue() ? (c.row.original.invited && (c.row.original.role === 'engineer' || c.row.original.role === 'office') ? 'Invited' : 'Active') : 'Deactivated') }),
    col.display({ id: 'actions', header: 'Change', cell: (c) => <Actions user={c.row.original} selfId={selfId} onDone={(text, tone) => setMessage({ text, tone })} /> }),
  ];
  return (
    <div className="flex flex-col gap-2">
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
      <DataTable
        endpoint="/api/v1/users"
        exportHref="/api/v1/users/export"
        columns={columns}
        defaultSort="name"
        filters={{ role }}
        noun="users"
        searchLabel="Search name or e-mail"
        testId="users"
        toolbar={<FilterSelect id="user-role" label="Role" value={role} onChange={setRole} options={Object.entries(ROLE_LABELS).map(([value, label]) => ({ value, label }))} />}
      />
    </div>
  );
}
