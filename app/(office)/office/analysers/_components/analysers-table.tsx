'use client';
// The analyser register with calibration state first to hand.
import { useState } from 'react';
import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import type { Analyser } from '@/db/analysers';
import { DataTable, FilterSelect } from '../../_components/data-table';
import { CalibrationBadge } from './calibration-badge';

const col = createColumnHelper<Analyser>();
const columns = [
  col.accessor('serial', { header: 'Serial', meta: { sort: 'serial' }, cell: (c) => <Link className="font-semibold text-copper underline" href={`/office/analysers/${c.row.original.id}`}>{c.getValue()}</Link> }),
  col.accessor((a) => `${a.make} ${a.model}`, { id: 'model', header: 'Make / model', meta: { sort: 'model' } }),
  col.accessor('calibratedOn', { header: 'Calibrated', meta: { sort: 'calibrated' } }),
  col.accessor('calibrationDue', { header: 'Due', meta: { sort: 'due' } }),
  col.accessor('status', { header: 'State', cell: (c) => <CalibrationBadge status={c.getValue()} /> }),
  col.accessor('assignedName', { header: 'Held by', cell: (c) => c.getValue() ?? '—' }),
];

export function AnalysersTable() {
  const [state, setState] = useState('');
  return (
    <DataTable
      endpoint="/api/v1/analysers"
      exportHref="/api/v1/analysers/export"
      columns={columns}
      defaultSort="due"
      filters={{ state }}
      noun="analysers"
      searchLabel="Search serial or model"
      testId="analysers"
      toolbar={<FilterSelect id="analyser-state" label="Calibration" value={state} onChange={setState} options={[{ value: 'overdue', label: 'Overdue' }, { value: 'due_soon', label: 'Due soon' }, { value: 'ok', label: 'In calibration' }]} />}
    />
  );
}
