// Demo scenario, part 6: billing. Both organisations' tax settings and price lists, and a dozen
// invoices for past visits of part 1: paid, unpaid (one overdue), part refunded, refunded, void and
// a draft. Seeded payments are bank transfers: the local card-payment fake starts empty on every
// demo run, so it has no record of older card payments to refund. All figures are invented.
import type { Knex } from 'knex';
import { buildVisitLines, type PriceItem } from '../lib/billing/catalogue';
import { computeInvoiceTotals } from '../lib/billing/totals';
import { deriveInvoiceStatus } from '../lib/billing/status';
import { addDays, demoIds, isoDate } from './demo-support';

function seedId(kind: number, index: number): string {
  const hex = (v: number, len: number) => v.toString(16).padStart(len, '0').slice(-len);
  return `${hex(9, 8)}-${hex(kind, 4)}-4000-8000-${hex(index, 12)}`;
}

export const demoBillingIds = {
  price: (i: number) => seedId(1, i),
  otherPrice: (i: number) => seedId(2, i),
  invoice: (i: number) => seedId(3, i),
  line: (invoice: number, line: number) => seedId(4, invoice * 100 + line),
};

type PriceSeed = Omit<PriceItem, 'id' | 'active'> & { active?: boolean };

const PRICES: PriceSeed[] = [
  { kind: 'visit', code: 'annual_check', name: 'Annual safety check', unitAmountMinor: 6500 },
  { kind: 'visit', code: 'service', name: 'Service visit', unitAmountMinor: 8500 },
  { kind: 'visit', code: 'breakdown', name: 'Breakdown call-out (first hour)', unitAmountMinor: 9900 },
  { kind: 'visit', code: 'follow_up', name: 'Follow-up visit', unitAmountMinor: 4000 },
  { kind: 'appliance', code: 'default', name: 'Appliance safety test', unitAmountMinor: 1800 },
  { kind: 'appliance', code: 'boiler', name: 'Boiler flue gas and safety test', unitAmountMinor: 2500 },
  { kind: 'appliance', code: 'condensing_boiler', name: 'Condensing boiler flue gas and safety test', unitAmountMinor: 2500 },
  { kind: 'appliance', code: 'furnace', name: 'Warm-air heater test', unitAmountMinor: 2800 },
  { kind: 'appliance', code: 'cooker', name: 'Cooker safety check', unitAmountMinor: 1500 },
  { kind: 'extra', code: null, name: 'CO alarm supplied and fitted', unitAmountMinor: 3450 },
  { kind: 'extra', code: null, name: 'Flue camera inspection', unitAmountMinor: 4500 },
  { kind: 'extra', code: null, name: 'Out-of-hours surcharge', unitAmountMinor: 5000 },
  { kind: 'extra', code: null, name: 'Spillage test re-run after remedial work', unitAmountMinor: 1250, active: false },
];

type Story = 'paid' | 'sent' | 'overdue' | 'partly_refunded' | 'refunded' | 'void' | 'draft';

// Which past annual-check visit (site index, see part 1) gets which story. Sites 22–29 are private
// homes; the rest are rented. Site 26 (a homeowner's) is left uninvoiced for raising one live.
const INVOICES: Array<{ site: number; story: Story; extras?: Array<[number, number]>; notes?: string }> = [
  { site: 0, story: 'paid' },
  { site: 1, story: 'paid', extras: [[9, 1]] },
  { site: 2, story: 'refunded', notes: 'Visit repeated free of charge after a missed appointment.' },
  { site: 3, story: 'partly_refunded', extras: [[10, 1]] },
  { site: 4, story: 'overdue' },
  { site: 6, story: 'sent', extras: [[9, 2]] },
  { site: 22, story: 'paid' },
  { site: 23, story: 'sent', extras: [[9, 1]] },
  { site: 24, story: 'sent' },
  { site: 25, story: 'refunded' },
  { site: 7, story: 'void' },
  { site: 8, story: 'draft' },
];

export async function seed(knex: Knex): Promise<void> {
  const now = new Date();
  const stamp = now.toISOString();
  await knex('billing_settings').insert([
    { organisation_id: demoIds.org, tax_rate_bp: 2000, tax_label: 'VAT', payment_terms_days: 14, invoice_prefix: 'KHS', created_at: stamp, updated_at: stamp },
    { organisation_id: demoIds.otherOrg, tax_rate_bp: 2000, tax_label: 'VAT', payment_terms_days: 30, invoice_prefix: 'DBC', created_at: stamp, updated_at: stamp },
  ]);

  const prices: PriceItem[] = PRICES.map((p, i) => ({ ...p, id: demoBillingIds.price(i), active: p.active ?? true }));
  await knex('prices').insert(
    prices.map((p, position) => ({
      id: p.id, organisation_id: demoIds.org, kind: p.kind, code: p.code, name: p.name, unit_amount_minor: p.unitAmountMinor, active: p.active, position, created_at: stamp, updated_at: stamp,
    })),
  );
  // The other organisation charges differently, so a leak between price lists would show.
  await knex('prices').insert([
    { id: demoBillingIds.otherPrice(0), organisation_id: demoIds.otherOrg, kind: 'visit', code: 'annual_check', name: 'Yearly check', unit_amount_minor: 7000, active: true, position: 0, created_at: stamp, updated_at: stamp },
    { id: demoBillingIds.otherPrice(1), organisation_id: demoIds.otherOrg, kind: 'appliance', code: 'default', name: 'Appliance', unit_amount_minor: 2000, active: true, position: 1, created_at: stamp, updated_at: stamp },
  ]);

  const invoices: Array<Record<string, unknown>> = [];
  const lines: Array<Record<string, unknown>> = [];
  const visits: Array<Record<string, unknown>> = await knex('visits as v')
    .join('sites as s', 's.id', 'v.site_id')
    .whereIn('v.id', INVOICES.map((inv) => demoIds.visit(inv.site, 0)))
    .select('v.id', 'v.kind', 'v.site_id', 'v.certified_at', 'v.window_start', 's.landlord_id', 's.homeowner_id');
  for (const visit of visits) {
    const index = INVOICES.findIndex((inv) => demoIds.visit(inv.site, 0) === visit.id);
    const spec = INVOICES[index];
    const categories: string[] = await knex('appliances').where({ site_id: visit.site_id, active: true }).pluck('category');
    const { lines: draft } = buildVisitLines({
      visitKind: String(visit.kind),
      applianceCategories: categories,
      prices,
      extras: (spec.extras ?? []).map(([price, quantity]) => ({ priceId: demoBillingIds.price(price), quantity })),
    });
    const totals = computeInvoiceTotals({ lines: draft, taxRateBp: 2000 });
    const done = new Date(String(visit.certified_at ?? visit.window_start));
    // Settled invoices were raised the day after the visit; the open ones more recently (one is
    // past its 14 days), the draft yesterday.
    const raised =
      spec.story === 'overdue' ? addDays(now, -30) : spec.story === 'sent' ? addDays(now, -3) : spec.story === 'draft' ? addDays(now, -1) : addDays(done, 1);
    const sent = spec.story !== 'draft';
    const issuedOn = isoDate(raised);
    const paidMinor = ['paid', 'partly_refunded', 'refunded'].includes(spec.story) ? totals.totalMinor : 0;
    const refundedMinor = spec.story === 'refunded' ? totals.totalMinor : spec.story === 'partly_refunded' ? 3000 : 0;
    const issueState = spec.story === 'void' ? 'void' : sent ? 'sent' : 'draft';
    const id = demoBillingIds.invoice(index);
    invoices.push({
      id,
      organisation_id: demoIds.org,
      visit_id: visit.id,
      site_id: visit.site_id,
      payer_id: visit.homeowner_id ?? visit.landlord_id,
      status: deriveInvoiceStatus({ issueState, totalMinor: totals.totalMinor, amountPaidMinor: paidMinor, amountRefundedMinor: refundedMinor }),
      currency: 'GBP',
      tax_rate_bp: 2000,
      tax_label: 'VAT',
      subtotal_minor: totals.subtotalMinor,
      tax_minor: totals.taxMinor,
      total_minor: totals.totalMinor,
      amount_paid_minor: paidMinor,
      amount_refunded_minor: refundedMinor,
      issued_on: sent ? issuedOn : null,
      due_on: sent ? isoDate(addDays(raised, 14)) : null,
      sent_at: sent ? raised.toISOString() : null,
      voided_at: spec.story === 'void' ? addDays(raised, 2).toISOString() : null,
      void_reason: spec.story === 'void' ? 'Raised against the wrong visit; the landlord is billed on the follow-up instead.' : null,
      paid_at: paidMinor > 0 ? addDays(raised, 6).toISOString() : null,
      paid_by: paidMinor > 0 ? 'bank_transfer' : null,
      notes: spec.notes ?? null,
      created_at: raised.toISOString(),
      updated_at: raised.toISOString(),
    });
    draft.forEach((line, position) =>
      lines.push({
        id: demoBillingIds.line(index, position),
        invoice_id: id,
        position,
        kind: line.kind,
        price_id: line.priceId,
        description: line.description,
        quantity: line.quantity,
        unit_amount_minor: line.unitAmountMinor,
        amount_minor: totals.lineAmountsMinor[position],
      }),
    );
  }
  // Numbered in the order they were raised, as the live counter would have done.
  invoices.sort((a, b) => String(a.created_at).localeCompare(String(b.created_at)));
  invoices.forEach((invoice, i) => (invoice.number = i + 1));
  const number = invoices.length;
  await knex.batchInsert('invoices', invoices, 50);
  await knex.batchInsert('invoice_lines', lines, 100);
  await knex('invoice_counters').insert({ organisation_id: demoIds.org, last_number: number });
}
