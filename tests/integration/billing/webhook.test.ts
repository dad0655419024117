// POST /api/v1/payments/webhook with events signed by the SDK's generateTestHeaderString: applied
// once, refused when forged or stale, replays and unknown types acknowledged without effect, and
// out-of-order refund/payment events ending in the right state.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freshDatabase } from '../../support/db';
import { closeDb, db } from '@/db/knex';
import { demoIds } from '@/seeds/demo-support';
import { demoBillingIds } from '@/seeds/06-demo-billing';
import * as webhookRoute from '@/app/api/v1/payments/webhook/route';
import { completedSession, makeEvent, mailsTo, refundedCharge, signedRequest, startBillingFakes, waitForMails, type BillingFakes } from './billing-support';

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

/** A seeded unpaid invoice (INVOICES indexes 4, 5, 7 and 8 of the billing seed) and its payer's e-mail. */
async function unpaid(index: number): Promise<{ id: string; total: number; payerEmail: string }> {
  const row: Row = await db()('invoices as i').join('users as u', 'u.id', 'i.payer_id').where('i.id', demoBillingIds.invoice(index)).first('i.id', 'i.total_minor', 'i.status', 'u.email');
  expect(row.status).toBe('sent');
  return { id: String(row.id), total: Number(row.total_minor), payerEmail: String(row.email) };
}

async function invoiceRow(id: string): Promise<Row> {
  return db()('invoices').where({ id }).first();
}

async function post(payload: string, options?: Parameters<typeof signedRequest>[1]) {
  const res = await webhookRoute.POST(signedRequest(payload, options));
  return { status: res.status, body: await res.json() };
}

describe('payment webhook', () => {
  it('applies a signed checkout.session.completed: the invoice is paid and the payer gets a receipt', async () => {
    const invoice = await unpaid(5);
    const payload = makeEvent({ type: 'checkout.session.completed', object: completedSession({ invoiceId: invoice.id, amountMinor: invoice.total }) });
    const res = await post(payload);
    expect(res).toEqual({ status: 200, body: { received: true, outcome: 'applied' } });
    const row = await invoiceRow(invoice.id);
    expect(row).toMatchObject({ status: 'paid', amount_paid_minor: invoice.total, paid_by: 'card' });
    expect(row.payment_intent_id).toMatch(/^pi_test_/);
    const receipts = await waitForMails(fakes, { to: invoice.payerEmail, subjectIncludes: 'Receipt', count: 1 });
    expect(receipts).toHaveLength(1);
    expect(receipts[0].attachments[0]).toMatchObject({ contentType: 'application/pdf' });
  });

  it('a replay of the same event answers 200 and changes nothing a second time', async () => {
    const invoice = await unpaid(7);
    const payload = makeEvent({ type: 'checkout.session.completed', object: completedSession({ invoiceId: invoice.id, amountMinor: invoice.total }) });
    expect((await post(payload)).body.outcome).toBe('applied');
    const after = await invoiceRow(invoice.id);
    await waitForMails(fakes, { to: invoice.payerEmail, subjectIncludes: 'Receipt', count: 1 });
    const replay = await post(payload);
    expect(replay).toEqual({ status: 200, body: { received: true, duplicate: true } });
    // Concurrent duplicates too: exactly one of them may be new, and here none is.
    const both = await Promise.all([post(payload), post(payload)]);
    expect(both.map((r) => r.body.duplicate)).toEqual([true, true]);
    expect(await invoiceRow(invoice.id)).toEqual(after);
    await new Promise((r) => setTimeout(r, 300));
    expect(await mailsTo(fakes, invoice.payerEmail, 'Receipt')).toHaveLength(1);
    const eventId = JSON.parse(payload).id;
    expect(await db()('payment_events').where({ id: eventId }).count({ c: '*' })).toEqual([{ c: 1 }]);
  });

  it('a bad signature is refused with 400 and nothing changes', async () => {
    const invoice = await unpaid(8);
    const payload = makeEvent({ type: 'checkout.session.completed', object: completedSession({ invoiceId: invoice.id, amountMinor: invoice.total }) });
    const forged = await post(payload, { secret: 'whsec_someone_else_entirely' });
    expect(forged.status).toBe(400);
    expect(forged.body).toEqual({ error: { code: 'bad_request', message: 'The webhook signature does not match.' } });
    // A valid signature over different bytes is no better.
    const tampered = signedRequest(payload);
    const altered = payload.replace(String(invoice.total), String(invoice.total - 1));
    const res = await webhookRoute.POST(new Request(tampered.url, { method: 'POST', headers: tampered.headers, body: altered }));
    expect(res.status).toBe(400);
    expect((await post(payload, { signature: null })).status).toBe(400);
    expect((await invoiceRow(invoice.id)).status).toBe('sent');
    expect(await db()('payment_events').where({ id: JSON.parse(payload).id }).first()).toBeUndefined();
  });

  it('a stale timestamp (older than 300 s) is refused with 400 even when correctly signed', async () => {
    const invoice = await unpaid(8);
    const payload = makeEvent({ type: 'checkout.session.completed', object: completedSession({ invoiceId: invoice.id, amountMinor: invoice.total }) });
    const stale = await post(payload, { timestampS: Math.floor(Date.now() / 1000) - 301 });
    expect(stale.status).toBe(400);
    expect(stale.body.error.message).toMatch(/too old/);
    expect((await invoiceRow(invoice.id)).status).toBe('sent');
    // Within the window it is accepted.
    const fresh = await post(payload, { timestampS: Math.floor(Date.now() / 1000) - 200 });
    expect(fresh.body.outcome).toBe('applied');
    expect((await invoiceRow(invoice.id)).status).toBe('paid');
  });

  it('an unknown event type answers 200 and is ignored', async () => {
    const before = await db()('invoices').orderBy('id').select('id', 'status', 'amount_paid_minor', 'updated_at');
    const payload = makeEvent({ type: 'customer.created', object: { id: 'cus_1', object: 'customer', metadata: { invoiceId: demoBillingIds.invoice(9), organisationId: demoIds.org } } });
    const res = await post(payload);
    expect(res).toEqual({ status: 200, body: { received: true, outcome: 'ignored' } });
    expect(await db()('invoices').orderBy('id').select('id', 'status', 'amount_paid_minor', 'updated_at')).toEqual(before);
    expect(await db()('payment_events').where({ id: JSON.parse(payload).id }).first('outcome')).toEqual({ outcome: 'ignored' });
  });

  it('a declined card leaves the invoice unpaid with the reason recorded', async () => {
    const row = { id: (await unpaid(4)).id };
    const failed = makeEvent({
      type: 'payment_intent.payment_failed',
      object: { id: 'pi_declined', object: 'payment_intent', status: 'requires_payment_method', last_payment_error: { message: 'Your card was declined.' }, metadata: { invoiceId: row.id, organisationId: demoIds.org } },
    });
    expect((await post(failed)).body.outcome).toBe('applied');
    expect(await invoiceRow(String(row.id))).toMatchObject({ status: 'sent', amount_paid_minor: 0, last_payment_error: 'Your card was declined. Nothing was charged.' });
  });

  it('a refund that arrives before its payment ends refunded, and the late payment event does not undo it', async () => {
    const invoice = await unpaid(4);
    const refund = makeEvent({ type: 'charge.refunded', object: refundedCharge({ invoiceId: invoice.id, amountMinor: invoice.total, refundedMinor: invoice.total }) });
    const payment = makeEvent({ type: 'checkout.session.completed', object: completedSession({ invoiceId: invoice.id, amountMinor: invoice.total }) });
    expect((await post(refund)).body.outcome).toBe('applied');
    expect(await invoiceRow(invoice.id)).toMatchObject({ status: 'refunded', amount_paid_minor: invoice.total, amount_refunded_minor: invoice.total });
    expect((await post(payment)).body.outcome).toBe('applied');
    expect(await invoiceRow(invoice.id)).toMatchObject({ status: 'refunded', amount_paid_minor: invoice.total, amount_refunded_minor: invoice.total });
  });

  it('two partial refunds delivered in reverse order end with the larger running total', async () => {
    const paidRow: Row = await db()('invoices').where({ id: demoBillingIds.invoice(5) }).first();
    const total = Number(paidRow.total_minor);
    const first = makeEvent({ type: 'charge.refunded', object: refundedCharge({ invoiceId: String(paidRow.id), amountMinor: total, refundedMinor: 1000 }) });
    const second = makeEvent({ type: 'charge.refunded', object: refundedCharge({ invoiceId: String(paidRow.id), amountMinor: total, refundedMinor: 2500 }) });
    await post(second);
    await post(first);
    expect(await invoiceRow(String(paidRow.id))).toMatchObject({ status: 'partly_refunded', amount_refunded_minor: 2500 });
  });

  it('an event naming an invoice of another organisation is recorded as unmatched and changes nothing', async () => {
    const id = demoBillingIds.invoice(11);
    const payload = makeEvent({ type: 'checkout.session.completed', object: completedSession({ invoiceId: id, amountMinor: 1, organisationId: demoIds.otherOrg }) });
    expect((await post(payload)).body.outcome).toBe('unmatched');
    expect(await invoiceRow(id)).toMatchObject({ status: 'draft', amount_paid_minor: 0 });
  });
});
