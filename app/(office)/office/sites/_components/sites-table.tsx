'use client';
// The office's site list: fetched from /api/v1/sites page by page, sorted and searched on the server.
import { useState } from 'react';
import useSWR from 'swr';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { fetchJson } from '@/lib/fetch-json';
import type { Page, SiteSummary } from '@/db/sites';
import { Input } from '@/components/ui/field';
import { Alert } from '@/components/ui/alert';

type Sort = 'reference' | 'address' | 'town' | 'postcode' | 'updated';
const col = createColumnHelper<SiteSummary>();
const columns = [
  col.accessor('reference', { header: 'Ref', meta: { sort: 'reference' } }),
  col.accessor((s) => [s.addressLine1, s.addressLine2].filter(Boolean).join(', '), { id: 'address', header: 'Address', meta: { sort: 'address' } }),
  col.accessor('town', { header: 'Town', meta: { sort: 'town' } }),
  col.accessor('postcode', { header: 'Postcode', meta: { sort: 'postcode' } }),
  col.accessor((s) => s.landlordName ?? s.homeownerName ?? '—', { id: 'customer', header: 'Landlord / homeowner' }),
  col.accessor('jurisdictionName', { header: 'Jurisdiction' }),
  col.accessor('applianceCount', { header: 'Appliances' }),
];

export function SitesTable() {
  const [page, setPage] = useState(1);
  const [q, setQ] = useState('');
  const [sort, setSort] = useState<Sort>('reference');
  const [dir, setDir] = useState<'asc' | 'desc'>('asc');
  const params = new URLSearchParams({ page: String(page), pageSize: '20', sort, dir, ...(q.trim() ? { q: q.trim() } : {}) });
  const { data, error, isLoading } = useSWR(`/api/v1/sites?${params}`, (url: string) => fetchJson<Page<SiteSummary>>(url), { keepPreviousData: true });
  const table = useReactTable({ data: data?.items ?? [], columns, getCoreRowModel: getCoreRowModel(), manualSorting: true, manualPagination: true });
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;

  function toggleSort(key: Sort) {
    if (sort === key) setDir(dir === 'asc' ? 'desc' : 'asc');
    else {
      setSort(key);
      setDir('asc');
    }
    setPage(1);
  }

  return (
    <div className="flex flex-col gap-3">
      <label className="flex flex-col gap-1 sm:max-w-sm">
        <span className="text-sm font-semibold">Search address, postcode or reference</span>
        <Input type="search" value={q} onChange={(e) => { setQ(e.target.value); setPage(1); }} placeholder="e.g. Ferrow Lane" />
      </label>
      {error ? <Alert tone="error">{(error as Error).message}</Alert> : null}
      <div className="overflow-x-auto rounded-xl border border-line bg-card">
        <table className="w-full min-w-[640px] text-left text-sm">
          <thead className="bg-paper">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const key = (h.column.columnDef.meta as { sort?: Sort } | undefined)?.sort;
                  const label = flexRender(h.column.columnDef.header, h.getContext());
                  return (
                    <th key={h.id} scope="col" className="px-3 py-2 font-semibold" aria-sort={key && key === sort ? (dir === 'asc' ? 'ascending' : 'descending') : undefined}>
                      {key ? (
                        <button type="button" className="inline-flex min-h-8 items-center gap-1 underline-offset-4 hover:underline" onClick={() => toggleSort(key)}>
                          {label}
                          <span aria-hidden="true">{key === sort ? (dir === 'asc' ? '▲' : '▼') : '↕'}</span>
                        </button>
                      ) : (
                        label
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-t border-line">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {!isLoading && data && data.items.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">No sites match.</td>
              </tr>
            ) : null}
            {isLoading && !data ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">Loading sites…</td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <div className="flex items-center gap-3 text-sm">
        <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 disabled:opacity-50" disabled={page <= 1} onClick={() => setPage(page - 1)}>
          Previous
        </button>
        <span data-testid="sites-page">
          Page {page} of {pages}
          {data ? ` · ${data.total} sites` : ''}
        </span>
        <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 disabled:opacity-50" disabled={page >= pages} onClick={() => setPage(page + 1)}>
          Next
        </button>
      </div>
    </div>
  );
}
