import 'server-only';
// The invoice as a PDF: who issues it and who pays, the property and visit, the lines, tax and
// total, and where it stands (unpaid, paid, refunded, void). Rendered on demand, never stored, so
// it always shows the invoice's current status.
import { Document, Page, StyleSheet, Text, View, renderToBuffer } from '@react-pdf/renderer';
import type { InvoiceDetail } from '@/db/invoices';
import { formatMoney, formatRatePct } from '@/lib/billing/money';
import { INVOICE_STATUS_LABELS, type InvoiceStatus } from '@/lib/billing/status';
import { BILLABLE_VISIT_KIND_LABELS, type BillableVisitKind } from '@/lib/billing/catalogue';
import { formatDateOnly } from '@/lib/billing/dates';
import { PDF_FONT, registerPdfFonts } from './fonts';
import { PdfPageHeader } from './page-header';
import { PDF_COLOURS, PDF_PAGE } from './theme';

const STATUS_COLOURS: Record<InvoiceStatus, { fg: string; bg: string }> = {
  draft: { fg: PDF_COLOURS.inkSoft, bg: PDF_COLOURS.paper },
  sent: { fg: PDF_COLOURS.copper, bg: PDF_COLOURS.copperSoft },
  paid: { fg: PDF_COLOURS.clear, bg: PDF_COLOURS.clearSoft },
  partly_refunded: { fg: PDF_COLOURS.service, bg: PDF_COLOURS.serviceSoft },
  refunded: { fg: PDF_COLOURS.service, bg: PDF_COLOURS.serviceSoft },
  void: { fg: PDF_COLOURS.inkSoft, bg: PDF_COLOURS.paper },
};

const s = StyleSheet.create({
  page: { fontFamily: PDF_FONT, fontSize: 10, color: PDF_COLOURS.ink, padding: PDF_PAGE.margin, paddingBottom: 60 },
  row: { flexDirection: 'row' },
  parties: { flexDirection: 'row', marginBottom: 14 },
  party: { flexGrow: 1, flexBasis: 0, paddingRight: 12 },
  label: { fontSize: 8, fontWeight: 700, color: PDF_COLOURS.inkSoft, textTransform: 'uppercase', letterSpacing: 0.6, marginBottom: 3 },
  strong: { fontWeight: 700 },
  soft: { color: PDF_COLOURS.inkSoft },
  status: { alignSelf: 'flex-start', paddingVertical: 4, paddingHorizontal: 8, borderRadius: 4, fontWeight: 700, fontSize: 11, marginBottom: 14 },
  facts: { flexDirection: 'row', borderTopWidth: 1, borderBottomWidth: 1, borderColor: PDF_COLOURS.line, paddingVertical: 8, marginBottom: 14 },
  fact: { flexGrow: 1, flexBasis: 0 },
  tableHead: { flexDirection: 'row', borderBottomWidth: 1, borderColor: PDF_COLOURS.ink, paddingBottom: 4, fontWeight: 700, fontSize: 9 },
  tableRow: { flexDirection: 'row', borderBottomWidth: 0.5, borderColor: PDF_COLOURS.line, paddingVertical: 5 },
  colDesc: { flexGrow: 1, flexBasis: 0, paddingRight: 8 },
  colQty: { width: 40, textAlign: 'right' },
  colUnit: { width: 80, textAlign: 'right' },
  colAmount: { width: 90, textAlign: 'right' },
  totals: { alignSelf: 'flex-end', width: 250, marginTop: 10 },
  totalRow: { flexDirection: 'row', justifyContent: 'space-between', paddingVertical: 3 },
  grandTotal: { flexDirection: 'row', justifyContent: 'space-between', borderTopWidth: 1.5, borderColor: PDF_COLOURS.ink, paddingTop: 5, marginTop: 3, fontWeight: 700, fontSize: 12 },
  notes: { marginTop: 18, padding: 8, backgroundColor: PDF_COLOURS.paper, borderRadius: 4 },
  footer: { position: 'absolute', left: PDF_PAGE.margin, right: PDF_PAGE.margin, bottom: 24, fontSize: 8, color: PDF_COLOURS.inkSoft, borderTopWidth: 0.5, borderColor: PDF_COLOURS.line, paddingTop: 6 },
});

/** What follows the status word in the status band, e.g. "UNPAID · £178.80 due by 16 December 2026". */
function statusDetail(invoice: InvoiceDetail): string {
  const money = (minor: number) => formatMoney(minor, invoice.currency);
  switch (invoice.status) {
    case 'sent':
      return invoice.dueOn ? `${money(invoice.totalMinor)} due by ${formatDateOnly(invoice.dueOn)}` : `${money(invoice.totalMinor)} due`;
    case 'paid':
      return `in full${invoice.paidAt ? ` on ${formatDateOnly(invoice.paidAt.slice(0, 10))}` : ''}`;
    case 'partly_refunded':
      return `${money(invoice.amountRefundedMinor)} of ${money(invoice.amountPaidMinor)} paid has been refunded`;
    case 'refunded':
      return `${money(invoice.amountRefundedMinor)} paid and refunded in full`;
    case 'void':
      return 'nothing to pay';
    case 'draft':
      return 'not yet issued';
  }
}

function visitLabel(kind: string): string {
  return BILLABLE_VISIT_KIND_LABELS[kind as BillableVisitKind] ?? kind;
}

export function InvoiceDocument({ invoice }: { invoice: InvoiceDetail }) {
  const money = (minor: number) => formatMoney(minor, invoice.currency);
  const colours = STATUS_COLOURS[invoice.status];
  const org = invoice.organisation;
  return (
    <Document title={`Invoice ${invoice.numberText}`} author={org.name} subject={`Invoice ${invoice.numberText} for ${invoice.payerName}`} creator="Hearthmark" producer="Hearthmark">
      <Page size={PDF_PAGE.size} style={s.page}>
        <PdfPageHeader organisation={org.name} title="Invoice" reference={invoice.numberText} />
        <Text style={[s.status, { color: colours.fg, backgroundColor: colours.bg }]}>
          {INVOICE_STATUS_LABELS[invoice.status].toUpperCase()} · {statusDetail(invoice)}
        </Text>

        <View style={s.parties}>
          <View style={s.party}>
            <Text style={s.label}>From</Text>
            <Text style={s.strong}>{org.name}</Text>
            {org.address ? <Text>{org.address}</Text> : null}
            {org.phone ? <Text>{org.phone}</Text> : null}
            {org.email ? <Text>{org.email}</Text> : null}
          </View>
          <View style={s.party}>
            <Text style={s.label}>Bill to</Text>
            <Text style={s.strong}>{invoice.payerName}</Text>
            <Text>{invoice.payerEmail}</Text>
          </View>
          <View style={s.party}>
            <Text style={s.label}>Property</Text>
            <Text>{invoice.site.addressLine1}</Text>
            {invoice.site.addressLine2 ? <Text>{invoice.site.addressLine2}</Text> : null}
            <Text>
              {invoice.site.town} {invoice.site.postcode}
            </Text>
            <Text style={s.soft}>Ref. {invoice.site.reference}</Text>
          </View>
        </View>

        <View style={s.facts}>
          <View style={s.fact}>
            <Text style={s.label}>Invoice number</Text>
            <Text style={s.strong}>{invoice.numberText}</Text>
          </View>
          <View style={s.fact}>
            <Text style={s.label}>Issued</Text>
            <Text>{invoice.issuedOn ? formatDateOnly(invoice.issuedOn) : 'Not yet issued'}</Text>
          </View>
          <View style={s.fact}>
            <Text style={s.label}>Due</Text>
            <Text>{invoice.dueOn ? formatDateOnly(invoice.dueOn) : '—'}</Text>
          </View>
          <View style={s.fact}>
            <Text style={s.label}>Visit</Text>
            <Text>
              {visitLabel(invoice.visitKind)}
              {invoice.visitDate ? `, ${formatDateOnly(invoice.visitDate)}` : ''}
            </Text>
          </View>
        </View>

        <View style={s.tableHead}>
          <Text style={s.colDesc}>Description</Text>
          <Text style={s.colQty}>Qty</Text>
          <Text style={s.colUnit}>Unit price</Text>
          <Text style={s.colAmount}>Amount</Text>
        </View>
        {invoice.lines.map((line) => (
          <View key={line.id} style={s.tableRow} wrap={false}>
            <Text style={s.colDesc}>{line.description}</Text>
            <Text style={s.colQty}>{line.quantity}</Text>
            <Text style={s.colUnit}>{money(line.unitAmountMinor)}</Text>
            <Text style={s.colAmount}>{money(line.amountMinor)}</Text>
          </View>
        ))}

        <View style={s.totals} wrap={false}>
          <View style={s.totalRow}>
            <Text>Subtotal</Text>
            <Text>{money(invoice.subtotalMinor)}</Text>
          </View>
          <View style={s.totalRow}>
            <Text>
              {invoice.taxLabel} at {formatRatePct(invoice.taxRateBp)}%
            </Text>
            <Text>{money(invoice.taxMinor)}</Text>
          </View>
          <View style={s.grandTotal}>
            <Text>Total</Text>
            <Text>{money(invoice.totalMinor)}</Text>
          </View>
          {invoice.amountPaidMinor > 0 ? (
            <View style={s.totalRow}>
              <Text>Paid{invoice.paidBy === 'bank_transfer' ? ' by bank transfer' : invoice.paidBy === 'card' ? ' by card' : ''}</Text>
              <Text>{money(invoice.amountPaidMinor)}</Text>
            </View>
          ) : null}
          {invoice.amountRefundedMinor > 0 ? (
            <View style={s.totalRow}>
              <Text>Refunded</Text>
              <Text>−{money(invoice.amountRefundedMinor)}</Text>
            </View>
          ) : null}
        </View>

        {invoice.notes ? (
          <View style={s.notes}>
            <Text style={s.label}>Notes</Text>
            <Text>{invoice.notes}</Text>
          </View>
        ) : null}
        {invoice.status === 'void' && invoice.voidReason ? (
          <View style={s.notes}>
            <Text style={s.label}>Why this invoice is void</Text>
            <Text>{invoice.voidReason}</Text>
          </View>
        ) : null}

        <View style={s.footer} fixed>
          <Text>
            {invoice.status === 'sent' ? 'Pay by card: sign in to Hearthmark with your e-mail address and open this invoice. ' : ''}
            Tax is charged once on the subtotal and rounded to the nearest {invoice.currency === 'GBP' ? 'penny' : 'minor unit'}.
            {org.registrationNumber ? ` ${org.name}, registration ${org.registrationNumber}.` : ''}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}

export async function renderInvoicePdf(invoice: InvoiceDetail): Promise<Buffer> {
  registerPdfFonts();
  return renderToBuffer(<InvoiceDocument invoice={invoice} />);
}

export function invoicePdfFilename(invoice: Pick<InvoiceDetail, 'numberText'>): string {
  return `invoice-${invoice.numberText}.pdf`;
}
