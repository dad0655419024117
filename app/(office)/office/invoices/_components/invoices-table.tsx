'use client';
// The office's invoices with where each payment stands; filter by status, search payer or number.
import { useState } from 'react';
import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import type { InvoiceSummary } from '@/db/invoices';
import { formatMoney } from '@/lib/billing/money';
import { formatDateOnly } from '@/lib/billing/dates';
import { INVOICE_STATUSES, INVOICE_STATUS_LABELS } from '@/lib/billing/status';
import { InvoiceStatusBadge } from '@/components/billing/invoice-status-badge';
import { DataTable, FilterSelect } from '../../_components/data-table';

const col = createColumnHelper<InvoiceSummary>();

function isOverdue(i: InvoiceSummary): boolean {
  return i.status === 'sent' && Boolean(i.dueOn) && (i.dueOn as string) < new Date().toISOString().slice(0, 10);
}

const columns = [
  col.accessor('numberText', {
    header: 'Number',
    meta: { sort: 'number' },
    cell: (c) => (
      <Link className="font-semibold whitespace-nowrap text-copper underline underline-offset-4" href={`/office/invoices/${c.row.original.id}`}>
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('status', {
    header: 'Status',
    meta: { sort: 'status' },
    cell: (c) => (
      <span className="flex flex-col items-start gap-1">
        <InvoiceStatusBadge status={c.getValue()} />
        {isOverdue(c.row.original) ? <span className="text-xs font-bold text-danger">Overdue</span> : null}
        {c.row.original.status === 'sent' && c.row.original.lastPaymentError ? <span className="text-xs font-semibold text-danger">Card declined</span> : null}
      </span>
    ),
  }),
  col.accessor('totalMinor', { header: 'Total', meta: { sort: 'total' }, cell: (c) => <span className="tabular whitespace-nowrap">{formatMoney(c.getValue(), c.row.original.currency)}</span> }),
  col.accessor('payerName', {
    header: 'Payer',
    meta: { sort: 'payer' },
    cell: (c) => (
      <>
        {c.getValue()}
        <span className="block text-xs text-ink-soft">{c.row.original.payerRole === 'landlord' ? 'Landlord' : 'Homeowner'}</span>
      </>
    ),
  }),
  col.accessor('siteAddress', { header: 'Property' }),
  col.display({
    id: 'payment',
    header: 'Paid / refunded',
    cell: (c) => {
      const i = c.row.original;
      if (i.amountPaidMinor === 0) return <span className="text-ink-soft">—</span>;
      return (
        <span className="tabular whitespace-nowrap">
          {formatMoney(i.amountPaidMinor, i.currency)}
          {i.amountRefundedMinor > 0 ? <span className="block text-xs text-service">−{formatMoney(i.amountRefundedMinor, i.currency)} refunded</span> : null}
        </span>
      );
    },
  }),
  col.accessor('issuedOn', { header: 'Issued', meta: { sort: 'issued' }, cell: (c) => <span className="whitespace-nowrap">{c.getValue() ? formatDateOnly(c.getValue() as string) : '—'}</span> }),
  col.accessor('dueOn', { header: 'Due', meta: { sort: 'due' }, cell: (c) => <span className="whitespace-nowrap">{c.getValue() ? formatDateOnly(c.getValue() as string) : '—'}</span> }),
];

export function InvoicesTable() {
  const [status, setStatus] = useState('');
  return (
    <DataTable
      endpoint="/api/v1/invoices"
      columns={columns}
      defaultSort="number"
      defaultDir="desc"
      filters={{ status }}
      noun="invoices"
      searchLabel="Search payer or invoice number"
      testId="invoices"
      minWidthPx={880}
      toolbar={
        <FilterSelect id="invoice-status" label="Status" value={status} onChange={setStatus} options={INVOICE_STATUSES.map((s) => ({ value: s, label: INVOICE_STATUS_LABELS[s] }))} />
      }
    />
  );
}
