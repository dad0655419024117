import { renderToBuffer } from '@react-pdf/renderer';
import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { INVOICE_VIEW_ROLES, invoiceAudience } from '@/lib/billing/audience';
import { getInvoice } from '@/db/invoices';
import { registerPdfFonts } from '@/lib/pdf/fonts';
import { InvoiceDocument, invoicePdfFilename } from '@/lib/pdf/invoice-document';

export const runtime = 'nodejs';

// The invoice PDF, rendered on request so it always shows the current status.
export const GET = apiRoute<{ id: string }>(INVOICE_VIEW_ROLES, async ({ user, params }) => {
  const invoice = await getInvoice(invoiceAudience(user), params.id);
  if (!invoice) throw new AppError('not_found', 'No such invoice.');
  registerPdfFonts();
  const buf = await renderToBuffer(<InvoiceDocument invoice={invoice} />);
  return new Response(new Uint8Array(buf), {
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': `inline; filename="${invoicePdfFilename(invoice)}"`,
      'cache-control': 'private, no-store',
    },
  });
});
