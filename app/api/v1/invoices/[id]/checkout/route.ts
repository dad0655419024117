import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { PAYER_ROLES, invoiceAudience } from '@/lib/billing/audience';
import { getInvoice, recordCheckoutSession } from '@/db/invoices';
import { openInvoiceCheckout } from '@/lib/payments/invoice-payments';

export const runtime = 'nodejs';

// The payer opens a hosted card-payment page for their own unpaid invoice; the browser goes there.
export const POST = apiRoute<{ id: string }>(PAYER_ROLES, async ({ user, params }) => {
  const invoice = await getInvoice(invoiceAudience(user), params.id);
  if (!invoice) throw new AppError('not_found', 'No such invoice.');
  if (invoice.status !== 'sent') {
    throw new AppError('conflict', invoice.status === 'void' ? 'This invoice is void: there is nothing to pay.' : 'This invoice is already paid.');
  }
  const session = await openInvoiceCheckout({ invoice, organisationId: user.organisationId, appUrl: env().NEXTAUTH_URL });
  await recordCheckoutSession({ organisationId: user.organisationId, id: invoice.id, sessionId: session.id });
  return { url: session.url };
});
