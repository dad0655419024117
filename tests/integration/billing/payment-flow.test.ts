// The whole card path through the official SDK and the local fake: the payer opens a checkout for
// their own invoice, a declined card leaves it unpaid with the reason, the good card pays it (the
// fake's signed webhook reaches the route), and the office refunds part then the rest.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { get, params, postJson } from '../../support/session';
import { closeDb, db } from '@/db/knex';
import { demoBillingIds } from '@/seeds/06-demo-billing';
import * as invoiceRoute from '@/app/api/v1/invoices/[id]/route';
import * as checkoutRoute from '@/app/api/v1/invoices/[id]/checkout/route';
import * as refundRoute from '@/app/api/v1/invoices/[id]/refund/route';
import { TEST_CARDS } from '../../../scripts/fakes/payment-fake';
import { as, office, rory, startBillingFakes, waitForMails, type BillingFakes } from './billing-support';

let fakes: BillingFakes;
const invoiceId = demoBillingIds.invoice(8); // Rory's unpaid invoice

beforeAll(async () => {
  fakes = await startBillingFakes();
  await freshDatabase({ seed: true });
});
afterAll(async () => {
  await closeDb();
  await fakes?.close();
});

async function pay(url: string, card: string): Promise<Response> {
  return fetch(url, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: new URLSearchParams({ card_number: card }).toString(), redirect: 'manual' });
}

async function invoice() {
  as(office);
  return (await (await invoiceRoute.GET(get('/x'), params({ id: invoiceId }))).json()) as { invoice: Record<string, unknown>; events: Array<{ type: string }> };
}

async function until(check: () => Promise<boolean>): Promise<void> {
  const deadline = Date.now() + 5000;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error('timed out waiting for the webhook');
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe('card payment through the SDK and the local fake', () => {
  let checkoutUrl = '';

  it('the payer opens a checkout for the invoice total, itemised with the tax line', async () => {
    as(rory);
    const res = await checkoutRoute.POST(postJson('/x', {}), params({ id: invoiceId }));
    expect(res.status).toBe(200);
    checkoutUrl = (await res.json()).url;
    expect(checkoutUrl).toMatch(new RegExp(`^${fakes.payment.baseUrl}/pay/cs_test_`));
    const row = await db()('invoices').where({ id: invoiceId }).first();
    const page = await (await fetch(checkoutUrl)).text();
    expect(page).toContain(`£${(Number(row.total_minor) / 100).toFixed(2)}`);
    expect(page).toContain('VAT');
  });

  it('a declined card leaves it unpaid with a clear reason', async () => {
    const res = await pay(checkoutUrl, TEST_CARDS.declined);
    expect(res.status).toBe(402);
    await until(async () => Boolean((await invoice()).invoice.lastPaymentError));
    const { invoice: after } = await invoice();
    expect(after).toMatchObject({ status: 'sent', amountPaidMinor: 0, lastPaymentError: 'Your card was declined. Nothing was charged.' });
  });

  it('the good card pays it, the payer gets a receipt, and the office sees the events', async () => {
    const res = await pay(checkoutUrl, TEST_CARDS.succeeds);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`http://localhost:3000/portal/invoices/${invoiceId}?checkout=done`);
    await until(async () => (await invoice()).invoice.status === 'paid');
    const { invoice: after, events } = await invoice();
    expect(after).toMatchObject({ status: 'paid', amountPaidMinor: after.totalMinor, paidBy: 'card', lastPaymentError: null });
    expect(after.paymentIntentId).toMatch(/^pi_/);
    expect(events.map((e) => e.type).sort()).toEqual(['checkout.session.completed', 'payment_intent.payment_failed']);
    expect(await waitForMails(fakes, { to: rory.email, subjectIncludes: 'Receipt', count: 1 })).toHaveLength(1);
    as(rory);
    expect((await checkoutRoute.POST(postJson('/x', {}), params({ id: invoiceId }))).status).toBe(409);
  });

  it('the office refunds part, then the rest; more than is left is refused', async () => {
    const total = Number((await invoice()).invoice.totalMinor);
    as(office);
    const part = await refundRoute.POST(postJson('/x', { amountMinor: 1000 }), params({ id: invoiceId }));
    expect(part.status).toBe(202);
    await until(async () => (await invoice()).invoice.status === 'partly_refunded');
    expect((await invoice()).invoice.amountRefundedMinor).toBe(1000);

    as(office);
    const tooMuch = await refundRoute.POST(postJson('/x', { amountMinor: total }), params({ id: invoiceId }));
    expect(tooMuch.status).toBe(422);
    expect((await tooMuch.json()).error.fields.amountMinor).toMatch(/At most £/);

    const rest = await refundRoute.POST(postJson('/x', { amountMinor: total - 1000 }), params({ id: invoiceId }));
    expect(rest.status).toBe(202);
    await until(async () => (await invoice()).invoice.status === 'refunded');
    expect((await invoice()).invoice.amountRefundedMinor).toBe(total);
    expect(await waitForMails(fakes, { to: rory.email, subjectIncludes: 'Refund of', count: 2 })).toHaveLength(2);

    as(office);
    expect((await refundRoute.POST(postJson('/x', { amountMinor: 1 }), params({ id: invoiceId }))).status).toBe(409);
  });

  it('an invoice paid by bank transfer cannot be refunded through the card service', async () => {
    as(office);
    const res = await refundRoute.POST(postJson('/x', { amountMinor: 100 }), params({ id: demoBillingIds.invoice(0) }));
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toMatch(/not paid by card/);
  });
});
