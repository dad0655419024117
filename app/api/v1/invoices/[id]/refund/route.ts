import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { formatMoney } from '@/lib/billing/money';
import { refundableMinor } from '@/lib/billing/status';
import { refundSchema } from '@/lib/validations/invoices';
import { getInvoice } from '@/db/invoices';
import { requestRefund } from '@/lib/payments/invoice-payments';

export const runtime = 'nodejs';

// Asks the payment service for a refund. The invoice moves when the service confirms it with a
// charge.refunded webhook, so this answers 202 Accepted.
export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  const { amountMinor } = await parseJson(req, refundSchema);
  const invoice = await getInvoice({ organisationId: user.organisationId }, params.id);
  if (!invoice) throw new AppError('not_found', 'No such invoice.');
  if (invoice.status !== 'paid' && invoice.status !== 'partly_refunded') throw new AppError('conflict', 'Only a paid invoice can be refunded.');
  const left = refundableMinor(invoice);
  if (amountMinor > left) {
    throw new AppError('invalid_input', 'Some fields are not valid.', { amountMinor: `At most ${formatMoney(left, invoice.currency)} can be refunded` });
  }
  const refund = await requestRefund({ invoice, organisationId: user.organisationId, amountMinor });
  return NextResponse.json({ refund, message: 'Refund requested. The invoice updates when the payment service confirms it.' }, { status: 202 });
});
