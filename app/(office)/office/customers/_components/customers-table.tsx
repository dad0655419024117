'use client';
// Landlords and homeowners, with how many sites each holds.
import { useState } from 'react';
import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import type { Customer } from '@/db/customers';
import { DataTable, FilterSelect } from '../../_components/data-table';

const col = createColumnHelper<Customer>();
const columns = [
  col.accessor('name', { header: 'Name', meta: { sort: 'name' }, cell: (c) => <Link className="font-semibold text-copper underline underline-offset-4" href={`/office/customers/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor('role', { header: 'Type', meta: { sort: 'role' }, cell: (c) => (c.getValue() === 'landlord' ? 'Landlord' : 'Homeowner') }),
  col.accessor('email', { header: 'E-mail', meta: { sort: 'email' } }),
  col.accessor('phone', { header: 'Phone', cell: (c) => c.getValue() ?? '—' }),
  col.accessor('siteCount', { header: 'Sites', meta: { sort: 'sites' } }),
];

export function CustomersTable() {
  const [role, setRole] = useState('');
  return (
    <DataTable
      endpoint="/api/v1/customers"
      exportHref="/api/v1/customers/export"
      columns={columns}
      defaultSort="name"
      filters={{ role }}
      noun="customers"
      searchLabel="Search name or e-mail"
      testId="customers"
      toolbar={<FilterSelect id="customer-role" label="Type" value={role} onChange={setRole} options={[{ value: 'landlord', label: 'Landlords' }, { value: 'homeowner', label: 'Homeowners' }]} />}
    />
  );
}
