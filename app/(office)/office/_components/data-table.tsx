'use client';
// The office's list tables: one server-sorted, server-paged table fed from an /api/v1 list endpoint
// through SWR and @tanstack/react-table. Each list supplies its columns and its filters.
import { useState, type ReactNode } from 'react';
import useSWR from 'swr';
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';
import { fetchJson } from '@/lib/fetch-json';
import { Input } from '@/components/ui/field';
import { Alert } from '@/components/ui/alert';

export type ListPage<T> = { items: T[]; total: number; page: number; pageSize: number };
export type SortMeta = { sort?: string };

export function DataTable<T extends { id: string }>({
  endpoint,
  columns,
  defaultSort,
  defaultDir = 'asc',
  filters = {},
  noun,
  searchLabel,
  testId,
  exportHref,
  toolbar,
  minWidthPx = 640,
}: {
  endpoint: string;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- column value types differ per column
  columns: ColumnDef<T, any>[];
  defaultSort: string;
  defaultDir?: 'asc' | 'desc';
  filters?: Record<string, string | undefined>;
  noun: string;
  searchLabel?: string;
  testId: string;
  exportHref?: string;
  toolbar?: ReactNode;
  minWidthPx?: number;
}) {
  const [page, setPage] = useState(1);
  const [q, setQ] = useState('');
  const [sort, setSort] = useState(defaultSort);
  const [dir, setDir] = useState<'asc' | 'desc'>(defaultDir);
  const active = Object.fromEntries(Object.entries(filters).filter(([, v]) => v)) as Record<string, string>;
  const params = new URLSearchParams({ page: String(page), pageSize: '20', sort, dir, ...(q.trim() ? { q: q.trim() } : {}), ...active });
  const filterKey = JSON.stringify(active);
  const [lastFilterKey, setLastFilterKey] = useState(filterKey);
  if (filterKey !== lastFilterKey) {
    // A new filter starts again from the first page.
    setLastFilterKey(filterKey);
    setPage(1);
  }
  const { data, error, isLoading } = useSWR(`${endpoint}?${params}`, (url: string) => fetchJson<ListPage<T>>(url), { keepPreviousData: true });
  const table = useReactTable({ data: data?.items ?? [], columns, getCoreRowModel: getCoreRowModel(), manualSorting: true, manualPagination: true, getRowId: (r) => r.id });
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  const exportParams = new URLSearchParams({ sort, dir, ...(q.trim() ? { q: q.trim() } : {}), ...active });

  function toggleSort(key: string) {
    if (sort === key) setDir(dir === 'asc' ? 'desc' : 'asc');
    else {
      setSort(key);
      setDir('asc');
    }
    setPage(1);
  }

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        {searchLabel ? (
          <label className="flex w-full flex-col gap-1 sm:max-w-sm">
            <span className="text-sm font-semibold">{searchLabel}</span>
            <Input type="search" value={q} onChange={(e) => { setQ(e.target.value); setPage(1); }} />
          </label>
        ) : null}
        {toolbar}
        {exportHref ? (
          <a href={`${exportHref}?${exportParams}`} className="inline-flex min-h-11 items-center rounded-lg border border-line bg-white px-4 text-sm font-semibold hover:border-ink-soft" download>
            Export CSV
          </a>
        ) : null}
      </div>
      {error ? <Alert tone="error">{(error as Error).message}</Alert> : null}
      <div className="overflow-x-auto rounded-xl border border-line bg-card">
        <table className="w-full text-left text-sm" style={{ minWidth: `${minWidthPx}px` }}>
          <thead className="bg-paper">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const key = (h.column.columnDef.meta as SortMeta | undefined)?.sort;
                  const label = flexRender(h.column.columnDef.header, h.getContext());
                  return (
                    <th key={h.id} scope="col" className="px-3 py-2 font-semibold" aria-sort={key && key === sort ? (dir === 'asc' ? 'ascending' : 'descending') : undefined}>
                      {key ? (
                        <button type="button" className="inline-flex min-h-11 items-center gap-1 underline-offset-4 hover:underline" onClick={() => toggleSort(key)}>
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
              <tr key={row.id} className="border-t border-line" data-testid={`${testId}-row`}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {!isLoading && data && data.items.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">No {noun} match.</td>
              </tr>
            ) : null}
            {isLoading && !data ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">Loading {noun}…</td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <div className="flex items-center gap-3 text-sm">
        <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 disabled:opacity-50" disabled={page <= 1} onClick={() => setPage(page - 1)}>
          Previous
        </button>
        <span data-testid={`${testId}-page`}>
          Page {page} of {pages}
          {data ? ` · ${data.total} ${noun}` : ''}
        </span>
        <button type="button" className="min-h-11 rounded-lg border border-line bg-white px-3 disabled:opacity-50" disabled={page >= pages} onClick={() => setPage(page + 1)}>
          Next
        </button>
      </div>
    </div>
  );
}

/** A select that fits the table toolbar. */
export function FilterSelect({ id, label, value, onChange, options }: { id: string; label: string; value: string; onChange: (v: string) => void; options: Array<{ value: string; label: string }> }) {
  return (
    <label htmlFor={id} className="flex flex-col gap-1">
      <span className="text-sm font-semibold">{label}</span>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value)} className="min-h-11 rounded-lg border border-line bg-white px-3 text-base">
        <option value="">All</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </label>
  );
}
