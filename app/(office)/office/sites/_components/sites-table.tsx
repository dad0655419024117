'use client';
// The office's site list: fetched from /api/v1/sites page by page, sorted, searched and filtered on the server.
import { useState } from 'react';
import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import type { SiteSummary } from '@/db/sites';
import { DataTable, FilterSelect } from '../../_components/data-table';

const col = createColumnHelper<SiteSummary>();
const columns = [
  col.accessor('reference', { header: 'Ref', meta: { sort: 'reference' }, cell: (c) => <Link className="font-semibold text-copper underline underline-offset-4" href={`/office/sites/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor((s) => [s.addressLine1, s.addressLine2].filter(Boolean).join(', '), { id: 'address', header: 'Address', meta: { sort: 'address' } }),
  col.accessor('town', { header: 'Town', meta: { sort: 'town' } }),
  col.accessor('postcode', { header: 'Postcode', meta: { sort: 'postcode' } }),
  col.accessor((s) => [s.landlordName, s.homeownerName].filter(Boolean).join(' / ') || '—', { id: 'customer', header: 'Landlord / homeowner' }),
  col.accessor('jurisdictionName', { header: 'Jurisdiction' }),
  col.accessor('applianceCount', { header: 'Appliances' }),
];

export function SitesTable({ jurisdictions, customerId }: { jurisdictions: Array<{ id: string; name: string }>; customerId?: string }) {
  const [jurisdictionId, setJurisdictionId] = useState('');
  return (
    <DataTable
      endpoint="/api/v1/sites"
      exportHref="/api/v1/sites/export"
      columns={columns}
      defaultSort="reference"
      filters={{ jurisdictionId, customerId }}
      noun="sites"
      searchLabel="Search address, postcode or reference"
      testId="sites"
      toolbar={<FilterSelect id="site-jurisdiction" label="Jurisdiction" value={jurisdictionId} onChange={setJurisdictionId} options={jurisdictions.map((j) => ({ value: j.id, label: j.name }))} />}
    />
  );
}
