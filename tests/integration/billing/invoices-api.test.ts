// /api/v1/invoices and /api/v1/prices: who sees which invoices, raising one from a visit (numbers
// without gaps or twins under concurrent requests), issuing, voiding, the PDF, the price list.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { extractText, getDocumentProxy } from 'unpdf';
import { freshDatabase } from '../../support/db';
import { get, noParams, params, postJson } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoIds } from '@/seeds/demo-support';
import { demoBillingIds } from '@/seeds/06-demo-billing';
import * as invoicesRoute from '@/app/api/v1/invoices/route';
import * as invoiceRoute from '@/app/api/v1/invoices/[id]/route';
import * as sendRoute from '@/app/api/v1/invoices/[id]/send/route';
import * as voidRoute from '@/app/api/v1/invoices/[id]/void/route';
import * as pdfRoute from '@/app/api/v1/invoices/[id]/pdf/route';
import * as checkoutRoute from '@/app/api/v1/invoices/[id]/checkout/route';
import * as refundRoute from '@/app/api/v1/invoices/[id]/refund/route';
import * as pricesRoute from '@/app/api/v1/prices/route';
import { getMessage } from '../../../scripts/fakes/mail-client';
import { as, engineer, hal, ines, landlord, office, otherOffice, startBillingFakes, waitForMails, type BillingFakes } from './billing-support';

let fakes: BillingFakes;

beforeAll(async () => {
  fakes = await startBillingFakes();
  await freshDatabase({ seed: true });
});
afterAll(async () => {
  await closeDb();
  await fakes?.close();
});

type Row = Record<string, unknown>;
const halSecondSiteVisit = demoIds.visit(26, 0);

async function pdfText(res: Response): Promise<string> {
  const pdf = await getDocumentProxy(new Uint8Array(await res.arrayBuffer()));
  const { text } = await extractText(pdf, { mergePages: true });
  return text;
}

/** Makes more certified visits at Hal's site so concurrent requests each have one to invoice. */
let made = 0;
async function extraVisits(count: number): Promise<string[]> {
  const ids = Array.from({ length: count }, () => `0000000a-0000-4000-8000-${String(made++).padStart(12, '0')}`);
  await db()('visits').insert(
    ids.map((id, i) => ({
      id, organisation_id: demoIds.org, site_id: demoIds.site(22), kind: i % 2 ? 'service' : 'follow_up', status: 'certified',
      window_start: new Date(Date.now() - (i + 1) * 86400_000).toISOString(), window_end: new Date(Date.now() - (i + 1) * 86400_000 + 3600_000).toISOString(),
    })),
  );
  return ids;
}

describe('who sees which invoices', () => {
  it('the office sees every invoice of its organisation, with payment status', async () => {
    as(office);
    const body = await (await invoicesRoute.GET(get('/api/v1/invoices?pageSize=100'), noParams)).json();
    expect(body.total).toBe(12);
    const statuses = new Set(body.items.map((i: { status: string }) => i.status));
    expect(statuses).toEqual(new Set(['paid', 'sent', 'refunded', 'partly_refunded', 'void', 'draft']));
    expect(body.items[0].number).toBe(12); // newest number first
    const paid = await (await invoicesRoute.GET(get('/api/v1/invoices?status=paid'), noParams)).json();
    expect(paid.items.every((i: { status: string; amountPaidMinor: number }) => i.status === 'paid' && i.amountPaidMinor > 0)).toBe(true);
    const byNumber = await (await invoicesRoute.GET(get('/api/v1/invoices?q=KHS-000003'), noParams)).json();
    expect(byNumber.items.map((i: { numberText: string }) => i.numberText)).toEqual(['KHS-000003']);
  });

  it('another organisation sees none of them, and a bad query is a 400', async () => {
    as(otherOffice);
    const body = await (await invoicesRoute.GET(get('/api/v1/invoices'), noParams)).json();
    expect(body.total).toBe(0);
    const res = await invoiceRoute.GET(get('/x'), params({ id: demoBillingIds.invoice(0) }));
    expect(res.status).toBe(404);
    as(office);
    const bad = await invoicesRoute.GET(get('/api/v1/invoices?status=lost'), noParams);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fields.status).toMatch(/status must be one of/);
  });

  it('a homeowner sees only their own issued invoices; another payer’s answers 404 everywhere', async () => {
    as(hal);
    const mine = await (await invoicesRoute.GET(get('/api/v1/invoices'), noParams)).json();
    const expected = await db()('invoices').where({ payer_id: hal.id }).whereNotNull('sent_at').pluck('id');
    expect(mine.items.map((i: { id: string }) => i.id).sort()).toEqual([...expected].sort());
    expect(mine.items.every((i: { payerId: string }) => i.payerId === hal.id)).toBe(true);

    const inesInvoice = demoBillingIds.invoice(7); // Ines's unpaid invoice
    for (const res of [
      await invoiceRoute.GET(get('/x'), params({ id: inesInvoice })),
      await pdfRoute.GET(get('/x'), params({ id: inesInvoice })),
      await checkoutRoute.POST(postJson('/x', {}), params({ id: inesInvoice })),
    ]) {
      expect(res.status).toBe(404);
      expect(await res.json()).toEqual({ error: { code: 'not_found', message: 'No such invoice.' } });
    }
    as(ines);
    expect((await invoiceRoute.GET(get('/x'), params({ id: inesInvoice }))).status).toBe(200);
  });

  it('customers never see drafts, cannot raise, send or refund, and engineers see no billing at all', async () => {
    const draft: Row = await db()('invoices').where({ status: 'draft' }).first();
    as(landlord);
    expect((await invoiceRoute.GET(get('/x'), params({ id: String(draft.id) }))).status).toBe(404);
    expect((await invoicesRoute.POST(postJson('/x', { visitId: halSecondSiteVisit, payerId: hal.id }), noParams)).status).toBe(403);
    expect((await sendRoute.POST(postJson('/x', {}), params({ id: String(draft.id) }))).status).toBe(403);
    expect((await refundRoute.POST(postJson('/x', { amountMinor: 1 }), params({ id: demoBillingIds.invoice(0) }))).status).toBe(403);
    as(engineer);
    expect((await invoicesRoute.GET(get('/api/v1/invoices'), noParams)).status).toBe(403);
  });
});

describe('raising, issuing and voiding', () => {
  let raisedId = '';

  it('raises a draft from a visit, priced from the list, with tax on the subtotal', async () => {
    as(office);
    const extra: Row = await db()('prices').where({ organisation_id: demoIds.org, kind: 'extra', active: true }).orderBy('position').first();
    const res = await invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: halSecondSiteVisit, payerId: hal.id, extras: [{ priceId: extra.id, quantity: 2 }] }), noParams);
    expect(res.status).toBe(201);
    const { invoice } = await res.json();
    raisedId = invoice.id;
    expect(invoice).toMatchObject({ number: 13, numberText: 'KHS-000013', status: 'draft', currency: 'GBP', payerId: hal.id, taxRateBp: 2000 });
    expect(invoice.lines[0]).toMatchObject({ kind: 'visit', description: 'Annual safety check', quantity: 1, unitAmountMinor: 6500 });
    expect(invoice.lines.at(-1)).toMatchObject({ kind: 'extra', quantity: 2, amountMinor: 2 * Number(extra.unit_amount_minor) });
    const subtotal = invoice.lines.reduce((sum: number, l: { amountMinor: number }) => sum + l.amountMinor, 0);
    expect(invoice.subtotalMinor).toBe(subtotal);
    expect(invoice.taxMinor).toBe(Math.floor((subtotal * 2000 + 5000) / 10000));
    expect(invoice.totalMinor).toBe(subtotal + invoice.taxMinor);
  });

  it('refuses a second live invoice for the same visit, a payer from elsewhere and an unknown extra', async () => {
    as(office);
    const again = await invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: halSecondSiteVisit, payerId: hal.id }), noParams);
    expect(again.status).toBe(409);
    const [visit] = await extraVisits(1);
    const wrongPayer = await invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: visit, payerId: ines.id }), noParams);
    expect(wrongPayer.status).toBe(422);
    expect((await wrongPayer.json()).error.fields.payerId).toMatch(/landlord or homeowner of the site/);
    const badExtra = await invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: visit, payerId: hal.id, extras: [{ priceId: demoIds.site(1), quantity: 1 }] }), noParams);
    expect(badExtra.status).toBe(422);
    const invalid = await invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: 'nope', payerId: hal.id, extras: [{ priceId: demoIds.site(1), quantity: 0 }] }), noParams);
    expect(invalid.status).toBe(422);
    expect(Object.keys((await invalid.json()).error.fields).sort()).toEqual(['extras.0.quantity', 'visitId']);
    as(otherOffice);
    expect((await invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: visit, payerId: hal.id }), noParams)).status).toBe(404);
    await db()('visits').where({ id: visit }).del();
  });

  it('numbers concurrent requests without gaps or duplicates', async () => {
    as(office);
    const visits = await extraVisits(6);
    const before = Number((await db()('invoice_counters').where({ organisation_id: demoIds.org }).first()).last_number);
    const responses = await Promise.all(visits.map((visitId) => invoicesRoute.POST(postJson('/api/v1/invoices', { visitId, payerId: hal.id }), noParams)));
    expect(responses.map((r) => r.status)).toEqual(visits.map(() => 201));
    const numbers = (await Promise.all(responses.map((r) => r.json()))).map((b) => b.invoice.number).sort((a, b) => a - b);
    expect(numbers).toEqual(visits.map((_, i) => before + 1 + i));
    // The same visit raced twice: one invoice, one 409, and no number used up by the loser.
    const [raced] = await extraVisits(1);
    const pair = await Promise.all([0, 1].map(() => invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: raced, payerId: hal.id }), noParams)));
    expect(pair.map((r) => r.status).sort()).toEqual([201, 409]);
    const all: number[] = await db()('invoices').where({ organisation_id: demoIds.org }).orderBy('number').pluck('number');
    expect(all).toEqual(all.map((_, i) => i + 1));
  });

  it('sending issues it, dates it and e-mails the payer a portal link and the PDF', async () => {
    as(office);
    const res = await sendRoute.POST(postJson('/x', {}), params({ id: raisedId }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.emailedTo).toBe(hal.email);
    expect(body.invoice.status).toBe('sent');
    expect(body.invoice.issuedOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(Date.parse(body.invoice.dueOn) - Date.parse(body.invoice.issuedOn)).toBe(14 * 86400_000);
    const [summary] = await waitForMails(fakes, { to: hal.email, subjectIncludes: 'KHS-000013', count: 1 });
    const mail = await getMessage(fakes.mail.httpUrl, summary.id);
    expect(mail.links).toContain(`http://localhost:3000/portal/invoices/${raisedId}`);
    expect(mail.attachments[0]).toMatchObject({ filename: 'invoice-KHS-000013.pdf', contentType: 'application/pdf' });
    // The payer now sees it.
    as(hal);
    expect((await invoiceRoute.GET(get('/x'), params({ id: raisedId }))).status).toBe(200);
  });

  it('the PDF shows organisation, payer, number, dates, lines, tax, total and status', async () => {
    as(hal);
    const res = await pdfRoute.GET(get('/x'), params({ id: raisedId }));
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    const text = await pdfText(res);
    const { invoice } = await (await invoiceRoute.GET(get('/x'), params({ id: raisedId }))).json();
    for (const expected of ['Kilnbrook Heating Safety Ltd', 'Hal Brennick', 'KHS-000013', 'Annual safety check', 'VAT at 20%', 'UNPAID', 'ISSUED', 'DUE']) {
      expect(text).toContain(expected);
    }
    const money = (minor: number) => `£${(minor / 100).toFixed(2)}`;
    expect(text).toContain(money(invoice.totalMinor));
    expect(text).toContain(money(invoice.taxMinor));
  });

  it('voids an unpaid invoice (the payer can no longer pay it) but never a paid one', async () => {
    as(office);
    const noReason = await voidRoute.POST(postJson('/x', {}), params({ id: raisedId }));
    expect(noReason.status).toBe(422);
    const res = await voidRoute.POST(postJson('/x', { reason: 'Sent to the wrong payer' }), params({ id: raisedId }));
    expect((await res.json()).invoice).toMatchObject({ status: 'void', voidReason: 'Sent to the wrong payer' });
    as(hal);
    expect((await checkoutRoute.POST(postJson('/x', {}), params({ id: raisedId }))).status).toBe(409);
    as(office);
    const paid = await voidRoute.POST(postJson('/x', { reason: 'Changed my mind' }), params({ id: demoBillingIds.invoice(0) }));
    expect(paid.status).toBe(409);
    // A voided visit can be invoiced again.
    expect((await invoicesRoute.POST(postJson('/api/v1/invoices', { visitId: halSecondSiteVisit, payerId: hal.id }), noParams)).status).toBe(201);
  });
});

describe('price list', () => {
  it('the office reads and replaces it; bad entries are named', async () => {
    as(office);
    const list = await (await pricesRoute.GET(get('/api/v1/prices'), noParams)).json();
    expect(list.settings).toMatchObject({ currency: 'GBP', taxRateBp: 2000, taxLabel: 'VAT', invoicePrefix: 'KHS' });
    expect(list.items.map((p: { kind: string }) => p.kind)[0]).toBe('visit');
    const items = list.items.map((p: Record<string, unknown>) => (p.code === 'annual_check' ? { ...p, unitAmountMinor: 7000 } : p));
    const put = (body: unknown) => pricesRoute.PUT(new Request('http://localhost:3000/api/v1/prices', { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) }), noParams);
    const saved = await (await put({ ...list.settings, taxRateBp: 1750, items })).json();
    expect(saved.settings.taxRateBp).toBe(1750);
    expect(saved.items.find((p: { code: string }) => p.code === 'annual_check').unitAmountMinor).toBe(7000);

    const bad = await put({ ...list.settings, taxRateBp: 12.5, items: [...items, { kind: 'visit', code: 'annual_check', name: 'Twice', unitAmountMinor: 10.5, active: true }] });
    expect(bad.status).toBe(422);
    const fields = (await bad.json()).error.fields;
    expect(fields.taxRateBp).toBeTruthy();
    expect(fields[`items.${items.length}.unitAmountMinor`]).toMatch(/whole minor units/);
    expect(fields[`items.${items.length}.code`]).toMatch(/already has a price/);

    as(otherOffice);
    const other = await (await pricesRoute.GET(get('/api/v1/prices'), noParams)).json();
    expect(other.items.map((p: { name: string }) => p.name)).toEqual(['Yearly check', 'Appliance']);
    as(hal);
    expect((await pricesRoute.GET(get('/api/v1/prices'), noParams)).status).toBe(403);
  });
});
