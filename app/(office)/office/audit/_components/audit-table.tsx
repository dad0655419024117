'use client';
// The audit log: who changed what and when, with the values before and after.
import { useState } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import type { AuditEntry } from '@/db/audit';
import { DataTable, FilterSelect } from '../../_components/data-table';

function Diff({ before, after }: { before: Record<string, unknown> | null; after: Record<string, unknown> | null }) {
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].filter((k) => JSON.stringify(before?.[k]) !== JSON.stringify(after?.[k]));
  if (!keys.length) return <span className="text-ink-soft">—</span>;
  const show = (v: unknown) => (v === null || v === undefined || v === '' ? '∅' : typeof v === 'object' ? JSON.stringify(v) : String(v));
  return (
    <details>
      <summary className="min-h-11 cursor-pointer py-2 font-semibold text-copper">{keys.length} field{keys.length === 1 ? '' : 's'}</summary>
      <dl className="grid grid-cols-[auto_1fr] gap-x-2 text-xs">
        {keys.map((k) => (
          <div key={k} className="contents">
            <dt className="font-semibold">{k}</dt>
            <dd><del className="text-danger">{before ? show(before[k]) : ''}</del> {before ? '→ ' : ''}<ins className="text-clear no-underline">{after ? show(after[k]) : ''}</ins></dd>
          </div>
        ))}
      </dl>
    </details>
  );
}

const col = createColumnHelper<AuditEntry>();
const columns = [
  col.accessor('at', { header: 'When', meta: { sort: 'at' }, cell: (c) => <span className="tabular whitespace-nowrap">{new Date(c.getValue()).toLocaleString('en-GB')}</span> }),
  col.accessor('actorName', { header: 'Who', cell: (c) => c.getValue() ?? 'system' }),
  col.accessor('entity', { header: 'What' }),
  col.accessor('summary', { header: 'Change' }),
  col.display({ id: 'diff', header: 'Before → after', cell: (c) => <Diff before={c.row.original.before} after={c.row.original.after} /> }),
];

const ENTITIES = ['customer', 'site', 'appliance', 'visit', 'analyser', 'user', 'calendar_feed', 'settings'];

export function AuditTable() {
  const [entity, setEntity] = useState('');
  const [from, setFrom] = useState('');
  return (
    <DataTable
      endpoint="/api/v1/audit"
      exportHref="/api/v1/audit/export"
      columns={columns}
      defaultSort="at"
      defaultDir="desc"
      filters={{ entity, from }}
      noun="changes"
      searchLabel="Search changes or people"
      testId="audit"
      minWidthPx={720}
      toolbar={
        <>
          <FilterSelect id="audit-entity" label="Record type" value={entity} onChange={setEntity} options={ENTITIES.map((e) => ({ value: e, label: e.replace('_', ' ') }))} />
          <label htmlFor="audit-from" className="flex flex-col gap-1 text-sm font-semibold">
            Since
            <input id="audit-from" type="date" value={from} onChange={(e) => setFrom(e.target.value)} className="min-h-11 rounded-lg border border-line bg-white px-3 text-base font-normal" />
          </label>
        </>
      }
    />
  );
}
