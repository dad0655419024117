// An invoice's lines, tax and total, and what has been paid and refunded: the same block on the
// office's invoice page and the payer's. Stacks on a phone, a table from small screens up.
import type { InvoiceDetail } from '@/db/invoices';
import { formatMoney, formatRatePct } from '@/lib/billing/money';

export function InvoiceLines({ invoice }: { invoice: InvoiceDetail }) {
  const money = (minor: number) => formatMoney(minor, invoice.currency);
  return (
    <section aria-labelledby="lines-heading" className="rounded-xl border border-line bg-card p-3 shadow-sm">
      <h2 id="lines-heading" className="sr-only">Charges</h2>
      <table className="w-full text-left text-sm tabular">
        <thead className="border-b border-ink/60 text-ink-soft">
          <tr>
            <th scope="col" className="py-2 pr-2 font-semibold">Item</th>
            <th scope="col" className="hidden py-2 pr-2 text-right font-semibold sm:table-cell">Qty</th>
            <th scope="col" className="hidden py-2 pr-2 text-right font-semibold sm:table-cell">Unit price</th>
            <th scope="col" className="py-2 text-right font-semibold">Amount</th>
          </tr>
        </thead>
        <tbody>
          {invoice.lines.map((line) => (
            <tr key={line.id} className="border-b border-line align-top" data-testid="invoice-line">
              <td className="py-2 pr-2">
                {line.description}
                <span className="block text-xs text-ink-soft sm:hidden">
                  {line.quantity} × {money(line.unitAmountMinor)}
                </span>
              </td>
              <td className="hidden py-2 pr-2 text-right sm:table-cell">{line.quantity}</td>
              <td className="hidden py-2 pr-2 text-right sm:table-cell">{money(line.unitAmountMinor)}</td>
              <td className="py-2 text-right">{money(line.amountMinor)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <dl className="mt-3 ml-auto grid max-w-xs grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm tabular">
        <dt>Subtotal</dt>
        <dd className="text-right">{money(invoice.subtotalMinor)}</dd>
        <dt>
          {invoice.taxLabel} at {formatRatePct(invoice.taxRateBp)}%
        </dt>
        <dd className="text-right">{money(invoice.taxMinor)}</dd>
        <dt className="border-t border-ink pt-1 text-base font-bold">Total</dt>
        <dd className="border-t border-ink pt-1 text-right text-base font-bold" data-testid="invoice-total">
          {money(invoice.totalMinor)}
        </dd>
        {invoice.amountPaidMinor > 0 ? (
          <>
            <dt>Paid{invoice.paidBy === 'card' ? ' by card' : invoice.paidBy === 'bank_transfer' ? ' by bank transfer' : ''}</dt>
            <dd className="text-right">{money(invoice.amountPaidMinor)}</dd>
          </>
        ) : null}
        {invoice.amountRefundedMinor > 0 ? (
          <>
            <dt>Refunded</dt>
            <dd className="text-right">−{money(invoice.amountRefundedMinor)}</dd>
          </>
        ) : null}
      </dl>
      <p className="mt-3 text-xs text-ink-soft">Tax is charged once on the subtotal and rounded to the nearest {invoice.currency === 'GBP' ? 'penny' : 'minor unit'}.</p>
    </section>
  );
}
