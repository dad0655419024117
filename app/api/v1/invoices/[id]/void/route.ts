import { apiRoute, parseJson } from '@/lib/api/handler';
import { voidSchema } from '@/lib/validations/invoices';
import { getCheckoutSessionId, voidInvoice } from '@/db/invoices';
import { expireCheckout } from '@/lib/payments/invoice-payments';

export const runtime = 'nodejs';

// Voids a draft or unpaid invoice and closes any payment page still open for it.
export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  const { reason } = await parseJson(req, voidSchema);
  const invoice = await voidInvoice({ organisationId: user.organisationId, id: params.id, reason });
  const sessionId = await getCheckoutSessionId({ organisationId: user.organisationId, id: invoice.id });
  if (sessionId) await expireCheckout(sessionId);
  return { invoice };
});
