import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { getInvoice, markInvoiceSent } from '@/db/invoices';
import { invoicePdfFilename, renderInvoicePdf } from '@/lib/pdf/invoice-document';
import { sendInvoiceMail } from '@/lib/mail/invoice-mail';

export const runtime = 'nodejs';

// Issues the invoice (draft → sent, dated) and e-mails it to the payer with the PDF and a portal
// link. Sending an issued invoice again only repeats the e-mail.
export const POST = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  const existing = await getInvoice({ organisationId: user.organisationId }, params.id);
  if (!existing) throw new AppError('not_found', 'No such invoice.');
  const invoice = await markInvoiceSent(user.organisationId, existing.id);
  try {
    const pdf = await renderInvoicePdf(invoice);
    await sendInvoiceMail({ invoice, appUrl: env().NEXTAUTH_URL, pdf, filename: invoicePdfFilename(invoice) });
  } catch (err) {
    console.error('[invoices] could not e-mail invoice', invoice.id, err);
    throw new AppError('internal', 'The invoice is issued, but the e-mail could not be sent. Try sending it again in a minute.');
  }
  return { invoice, emailedTo: invoice.payerEmail };
});
