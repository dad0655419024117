import 'server-only';
// After a payment event has moved an invoice: the payer's receipt when money first arrives, and a
// note for each refund. A failed e-mail is logged and never undoes the payment record.
import { env } from '@/lib/env';
import { getInvoice } from '@/db/invoices';
import type { InvoicePaymentState } from '@/db/payments';
import { invoicePdfFilename, renderInvoicePdf } from '@/lib/pdf/invoice-document';
import { sendReceiptMail, sendRefundMail } from '@/lib/mail/invoice-mail';

export async function notifyPayer(input: { organisationId: string; invoiceId: string; before: InvoicePaymentState; after: InvoicePaymentState }): Promise<void> {
  const { before, after } = input;
  const newlyPaid = before.amountPaidMinor === 0 && after.amountPaidMinor > 0;
  const refundedNow = after.amountRefundedMinor - before.amountRefundedMinor;
  if (!newlyPaid && refundedNow <= 0) return;
  try {
    const invoice = await getInvoice({ organisationId: input.organisationId }, input.invoiceId);
    if (!invoice) return;
    const appUrl = env().NEXTAUTH_URL;
    if (newlyPaid) {
      const pdf = await renderInvoicePdf(invoice);
      await sendReceiptMail({ invoice, appUrl, pdf, filename: invoicePdfFilename(invoice) });
    }
    if (refundedNow > 0) await sendRefundMail({ invoice, appUrl, refundedNowMinor: refundedNow });
  } catch (err) {
    console.error('[payments] could not e-mail the payer about invoice', input.invoiceId, err);
  }
}
