'use client';
// Every appliance of the organisation, across sites.
import { useState } from 'react';
import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import type { Appliance } from '@/db/appliances';
import { APPLIANCE_CATEGORIES, APPLIANCE_CATEGORY_LABELS, type ApplianceCategory } from '@/lib/limits/types';
import { DataTable, FilterSelect } from '../../_components/data-table';

const col = createColumnHelper<Appliance>();
const columns = [
  col.accessor('siteReference', { header: 'Site', meta: { sort: 'site' }, cell: (c) => <Link className="font-semibold text-copper underline" href={`/office/sites/${c.row.original.siteId}/appliances/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor('category', { header: 'Category', meta: { sort: 'category' }, cell: (c) => APPLIANCE_CATEGORY_LABELS[c.getValue() as ApplianceCategory] ?? c.getValue() }),
  col.accessor('fuel', { header: 'Fuel', meta: { sort: 'fuel' } }),
  col.accessor('location', { header: 'Location', meta: { sort: 'location' } }),
  col.accessor((a) => [a.make, a.model].filter(Boolean).join(' ') || '—', { id: 'make', header: 'Make / model', meta: { sort: 'make' } }),
  col.accessor('serial', { header: 'Serial', cell: (c) => c.getValue() ?? '—' }),
];

export function AppliancesTable() {
  const [category, setCategory] = useState('');
  return (
    <DataTable
      endpoint="/api/v1/appliances"
      exportHref="/api/v1/appliances/export"
      columns={columns}
      defaultSort="site"
      filters={{ category }}
      noun="appliances"
      searchLabel="Search make, model, serial, location or site"
      testId="appliances"
      toolbar={<FilterSelect id="appliance-category" label="Category" value={category} onChange={setCategory} options={APPLIANCE_CATEGORIES.map((c) => ({ value: c, label: APPLIANCE_CATEGORY_LABELS[c] }))} />}
    />
  );
}
