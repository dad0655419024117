import 'server-only';
// The billing e-mails to the payer: the invoice (with its PDF and a link to pay in the portal), the
// receipt once the card payment is confirmed, and the note of a refund.
import { sendMail } from './transport';
import { escapeHtml } from '@/lib/text';
import { formatMoney } from '@/lib/billing/money';
import { formatDateOnly } from '@/lib/billing/dates';
import type { InvoiceDetail } from '@/db/invoices';

export function invoicePortalUrl(appUrl: string, invoiceId: string): string {
  return `${appUrl.replace(/\/+$/, '')}/portal/invoices/${invoiceId}`;
}

function paragraphs(lines: Array<string | { link: string; label: string }>): { text: string; html: string } {
  const text = lines.map((l) => (typeof l === 'string' ? l : `${l.label}: ${l.link}`)).join('\n\n');
  const html = lines
    .map((l) => (typeof l === 'string' ? `<p>${escapeHtml(l)}</p>` : `<p><a href="${escapeHtml(l.link)}">${escapeHtml(l.label)}</a></p>`))
    .join('');
  return { text, html };
}

const SIGN_IN_NOTE = 'The link opens the invoice in Hearthmark. If you are not signed in, enter your e-mail address and we send you a one-time sign-in link; no password needed.';

export async function sendInvoiceMail(input: { invoice: InvoiceDetail; appUrl: string; pdf: Buffer; filename: string }): Promise<void> {
  const { invoice } = input;
  const total = formatMoney(invoice.totalMinor, invoice.currency);
  const body = paragraphs([
    `Hello ${invoice.payerName},`,
    `${invoice.organisation.name} has issued invoice ${invoice.numberText} for ${total} for the visit to ${invoice.site.addressLine1}, ${invoice.site.town}.`,
    invoice.dueOn ? `Please pay by ${formatDateOnly(invoice.dueOn)}. You can pay by card online.` : 'You can pay by card online.',
    { link: invoicePortalUrl(input.appUrl, invoice.id), label: 'View and pay the invoice' },
    SIGN_IN_NOTE,
    'The invoice is attached as a PDF.',
  ]);
  await sendMail({
    to: invoice.payerEmail,
    subject: `Invoice ${invoice.numberText} from ${invoice.organisation.name}: ${total}`,
    ...body,
    attachments: [{ filename: input.filename, content: input.pdf, contentType: 'application/pdf' }],
  });
}

export async function sendReceiptMail(input: { invoice: InvoiceDetail; appUrl: string; pdf: Buffer; filename: string }): Promise<void> {
  const { invoice } = input;
  const paid = formatMoney(invoice.amountPaidMinor, invoice.currency);
  const body = paragraphs([
    `Hello ${invoice.payerName},`,
    `Thank you: we have received your card payment of ${paid} for invoice ${invoice.numberText} from ${invoice.organisation.name}.`,
    'Nothing more is due on this invoice. Keep this e-mail as your receipt; the paid invoice is attached.',
    { link: invoicePortalUrl(input.appUrl, invoice.id), label: 'View the invoice' },
  ]);
  await sendMail({
    to: invoice.payerEmail,
    subject: `Receipt: ${paid} paid for invoice ${invoice.numberText}`,
    ...body,
    attachments: [{ filename: input.filename, content: input.pdf, contentType: 'application/pdf' }],
  });
}

export async function sendRefundMail(input: { invoice: InvoiceDetail; appUrl: string; refundedNowMinor: number }): Promise<void> {
  const { invoice } = input;
  const amount = formatMoney(input.refundedNowMinor, invoice.currency);
  const body = paragraphs([
    `Hello ${invoice.payerName},`,
    `${invoice.organisation.name} has refunded ${amount} of your payment for invoice ${invoice.numberText} to the card you paid with. Card refunds usually show within 5 to 10 working days.`,
    { link: invoicePortalUrl(input.appUrl, invoice.id), label: 'View the invoice' },
  ]);
  await sendMail({ to: invoice.payerEmail, subject: `Refund of ${amount} for invoice ${invoice.numberText}`, ...body });
}
