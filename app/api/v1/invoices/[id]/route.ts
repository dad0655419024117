import { apiRoute } from '@/lib/api/handler';
import { INVOICE_VIEW_ROLES, invoiceAudience } from '@/lib/billing/audience';
import { AppError } from '@/lib/errors';
import { getInvoice } from '@/db/invoices';
import { listInvoicePaymentEvents } from '@/db/payments';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(INVOICE_VIEW_ROLES, async ({ user, params }) => {
  // Another organisation's or payer's invoice answers exactly like a missing one.
  const invoice = await getInvoice(invoiceAudience(user), params.id);
  if (!invoice) throw new AppError('not_found', 'No such invoice.');
  if (user.role !== 'office') return { invoice };
  return { invoice, events: await listInvoicePaymentEvents({ organisationId: user.organisationId, invoiceId: invoice.id }) };
});
