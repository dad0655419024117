'use client';
// Sites by certificate expiry, with due-soon and overdue first to hand.
import { useState } from 'react';
import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import type { SiteRenewal } from '@/db/reminders';
import { DataTable, FilterSelect } from '../../_components/data-table';
import { RenewalBadge } from './renewal-badge';

const col = createColumnHelper<SiteRenewal>();
const columns = [
  col.accessor('reference', { header: 'Site', meta: { sort: 'site' }, cell: (c) => <Link className="font-semibold text-copper underline" href={`/office/sites/${c.row.original.siteId}`}>{c.getValue()}</Link> }),
  col.accessor((r) => `${r.address}, ${r.postcode}`, { id: 'address', header: 'Address' }),
  col.accessor('town', { header: 'Town', meta: { sort: 'town' } }),
  col.accessor('expiresOn', { header: 'Expires', meta: { sort: 'expires' }, cell: (c) => <span className="tabular">{c.getValue() ?? '—'}</span> }),
  col.accessor('state', { header: 'State', cell: (c) => <RenewalBadge state={c.getValue()} daysLeft={c.row.original.daysLeft} /> }),
  col.accessor('recipientName', { header: 'Reminder goes to', cell: (c) => c.getValue() ?? '—' }),
  col.accessor('nextVisitAt', { header: 'Next visit', cell: (c) => (c.getValue() ? String(c.getValue()).slice(0, 10) : <Link className="text-copper underline" href={`/office/board/new?siteId=${c.row.original.siteId}`}>Book</Link>) }),
];

export function RenewalsTable() {
  const [state, setState] = useState('attention');
  return (
    <DataTable
      endpoint="/api/v1/renewals"
      exportHref="/api/v1/renewals/export"
      columns={columns}
      defaultSort="expires"
      filters={{ state }}
      noun="sites"
      searchLabel="Search site, address or customer"
      testId="renewals"
      toolbar={
        <FilterSelect id="renewal-state" label="Show" value={state} onChange={setState} options={[{ value: 'attention', label: 'Due soon or overdue' }, { value: 'overdue', label: 'Overdue' }, { value: 'due_soon', label: 'Due soon' }, { value: 'ok', label: 'In date' }, { value: 'none', label: 'No certificate' }]} />
      }
    />
  );
}
