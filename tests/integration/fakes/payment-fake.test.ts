import { mkdtemp, rm } from 'node:fs/promises';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { DEFAULT_SECRET_KEY, startPaymentFake, type EventRecord, type PaymentFake } from '../../../scripts/fakes/payment-fake';

const WEBHOOK_SECRET = 'whsec_test_fake_suite';
const quiet = (): void => {};

interface Received {
  rawBody: string;
  signature: string;
}

/** Stands in for the app's webhook route: keeps raw bodies so the SDK can verify them. */
class WebhookReceiver {
  received: Received[] = [];
  failNext = 0;
  private server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      if (this.failNext > 0) {
        this.failNext -= 1;
        res.writeHead(500).end('not now');
        return;
      }
      this.received.push({ rawBody: Buffer.concat(chunks).toString('utf8'), signature: String(req.headers['stripe-signature'] ?? '') });
      res.writeHead(200, { 'content-type': 'application/json' }).end('{"received":true}');
    });
  });

  async start(): Promise<string> {
    await new Promise<void>((resolve) => this.server.listen(0, '127.0.0.1', resolve));
    return `http://127.0.0.1:${(this.server.address() as AddressInfo).port}/api/v1/payments/webhook`;
  }

  close(): Promise<void> {
    this.server.closeAllConnections();
    return new Promise((resolve) => this.server.close(() => resolve()));
  }

  /** Verifies every delivery exactly as the app will, then finds one by type. */
  async waitFor(type: string, predicate: (event: Stripe.Event) => boolean = () => true, timeoutMs = 5000): Promise<Stripe.Event> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const events = this.received.map((r) => Stripe.webhooks.constructEvent(r.rawBody, r.signature, WEBHOOK_SECRET));
      const found = events.find((e) => e.type === type && predicate(e));
      if (found) return found;
      if (Date.now() > deadline) throw new Error(`No ${type} webhook; got ${events.map((e) => e.type).join(', ') || 'none'}`);
      await new Promise((resolve) => setTimeout(resolve, 25));
    }
  }
}

const receiver = new WebhookReceiver();
let fake: PaymentFake;
let stripe: Stripe;

function sdkFor(port: number, key = DEFAULT_SECRET_KEY): Stripe {
  return new Stripe(key, { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
}

async function pay(sessionId: string, cardNumber: string): Promise<Response> {
  return fetch(`${fake.baseUrl}/pay/${sessionId}`, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ card_number: cardNumber }).toString(),
    redirect: 'manual',
  });
}

async function createInvoiceSession(extra: Partial<Stripe.Checkout.SessionCreateParams> = {}): Promise<Stripe.Checkout.Session> {
  return stripe.checkout.sessions.create({
    mode: 'payment',
    line_items: [
      { price_data: { currency: 'gbp', unit_amount: 8500, product_data: { name: 'Annual boiler service' } }, quantity: 1 },
      { price_data: { currency: 'gbp', unit_amount: 1250, product_data: { name: 'CO alarm' } }, quantity: 2 },
    ],
    success_url: 'http://127.0.0.1:3000/portal/invoices/inv_1/paid?session={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:3000/portal/invoices/inv_1',
    metadata: { invoiceId: 'inv_1', organisationId: 'org_1' },
    client_reference_id: 'inv_1',
    payment_intent_data: { metadata: { invoiceId: 'inv_1' } },
    ...extra,
  });
}

beforeAll(async () => {
  const webhookUrl = await receiver.start();
  fake = await startPaymentFake({ port: 0, webhookUrl, webhookSecret: WEBHOOK_SECRET, webhookRetryDelaysMs: [50, 100, 150], log: quiet });
  stripe = sdkFor(fake.port);
});

afterAll(async () => {
  await fake?.close();
  await receiver.close();
});

beforeEach(() => {
  receiver.received = [];
  receiver.failNext = 0;
});

describe('payment fake through the official SDK', () => {
  it('creates, retrieves and lists customers', async () => {
    const customer = await stripe.customers.create({ email: 'landlord@example.test', name: 'Pat Landlord', metadata: { customerId: 'c_9' } });
    expect(customer.id).toMatch(/^cus_/);
    expect(customer).toMatchObject({ object: 'customer', livemode: false, email: 'landlord@example.test', metadata: { customerId: 'c_9' } });
    expect(typeof customer.created).toBe('number');
    expect((await stripe.customers.retrieve(customer.id)).id).toBe(customer.id);
    const listed = await stripe.customers.list({ email: 'landlord@example.test', limit: 5 });
    expect(listed.data.map((c) => c.id)).toEqual([customer.id]);
  });

  it('creates a checkout session from bracket-encoded line items', async () => {
    const customer = await stripe.customers.create({ email: 'payer@example.test' });
    const session = await createInvoiceSession({ customer: customer.id });
    expect(session.id).toMatch(/^cs_test_/);
    expect(session).toMatchObject({
      object: 'checkout.session',
      amount_total: 8500 + 2 * 1250,
      currency: 'gbp',
      status: 'open',
      payment_status: 'unpaid',
      customer: customer.id,
      metadata: { invoiceId: 'inv_1', organisationId: 'org_1' },
      client_reference_id: 'inv_1',
      livemode: false,
    });
    expect(session.url).toBe(`${fake.baseUrl}/pay/${session.id}`);

    const expanded = await stripe.checkout.sessions.retrieve(session.id, { expand: ['line_items'] });
    expect(expanded.line_items?.data.map((li) => [li.description, li.quantity, li.amount_total])).toEqual([
      ['Annual boiler service', 1, 8500],
      ['CO alarm', 2, 2500],
    ]);
  });

  it('pays with the good card: redirect, signed checkout.session.completed, paid session and intent', async () => {
    const session = await createInvoiceSession({ customer_email: 'tenant@example.test' });
    const pageRes = await fetch(session.url as string);
    const html = await pageRes.text();
    expect(pageRes.status).toBe(200);
    expect(html).toContain('<title>Test card payment (local fake)</title>');
    expect(html).toContain('£110.00');
    expect(html).toContain('Annual boiler service');
    expect(html).toContain('<label for="card_number">');
    expect(html).toContain('href="http://127.0.0.1:3000/portal/invoices/inv_1"');

    const res = await pay(session.id, '4242 4242 4242 4242');
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`http://127.0.0.1:3000/portal/invoices/inv_1/paid?session=${session.id}`);

    const event = await receiver.waitFor('checkout.session.completed');
    expect(event.id).toMatch(/^evt_/);
    expect(event.livemode).toBe(false);
    const completed = event.data.object as Stripe.Checkout.Session;
    expect(completed).toMatchObject({ id: session.id, status: 'complete', payment_status: 'paid', metadata: { invoiceId: 'inv_1', organisationId: 'org_1' } });

    const after = await stripe.checkout.sessions.retrieve(session.id);
    expect(after).toMatchObject({ status: 'complete', payment_status: 'paid' });
    expect(after.payment_intent).toMatch(/^pi_/);
    expect(after.customer_details?.email).toBe('tenant@example.test');
    const intent = await stripe.paymentIntents.retrieve(after.payment_intent as string);
    expect(intent).toMatchObject({ status: 'succeeded', amount: 11000, amount_received: 11000, currency: 'gbp', metadata: { invoiceId: 'inv_1' } });
    expect(intent.latest_charge).toMatch(/^ch_/);

    const again = await pay(session.id, '4242424242424242');
    expect(again.status).toBe(409);
    expect(await again.text()).toMatch(/already paid/i);
    expect(await (await fetch(`${fake.baseUrl}/pay/${session.id}`)).text()).toMatch(/already paid/i);
  });

  it('declines the decline card: payment_failed event, session stays open, page explains', async () => {
    const session = await createInvoiceSession();
    const res = await pay(session.id, '4000000000000002');
    expect(res.status).toBe(402);
    const html = await res.text();
    expect(html).toMatch(/role="alert"[^>]*>Your card was declined/);

    const event = await receiver.waitFor('payment_intent.payment_failed');
    const failed = event.data.object as Stripe.PaymentIntent;
    expect(failed.status).toBe('requires_payment_method');
    expect(failed.last_payment_error).toMatchObject({ code: 'card_declined', decline_code: 'generic_decline', message: 'Your card was declined.' });
    expect(failed.metadata).toEqual({ invoiceId: 'inv_1' });

    const still = await stripe.checkout.sessions.retrieve(session.id);
    expect(still).toMatchObject({ status: 'open', payment_status: 'unpaid' });

    const unknown = await pay(session.id, '1234 5678');
    expect(unknown.status).toBe(422);
    expect(await unknown.text()).toContain('Use a test card: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined');

    // A later good card completes the same session and intent.
    expect((await pay(session.id, '4242424242424242')).status).toBe(303);
    const paid = await stripe.checkout.sessions.retrieve(session.id);
    expect(paid.payment_intent).toBe(failed.id);
    expect((await stripe.paymentIntents.retrieve(failed.id)).last_payment_error).toBeNull();
  });

  it('refunds part, then the rest, then refuses more', async () => {
    const session = await createInvoiceSession();
    await pay(session.id, '4242424242424242');
    const intentId = (await stripe.checkout.sessions.retrieve(session.id)).payment_intent as string;

    const partial = await stripe.refunds.create({ payment_intent: intentId, amount: 3000, metadata: { reason: 'goodwill' } });
    expect(partial.id).toMatch(/^re_/);
    expect(partial).toMatchObject({ object: 'refund', amount: 3000, status: 'succeeded', payment_intent: intentId, currency: 'gbp' });
    const first = await receiver.waitFor('charge.refunded');
    expect(first.data.object).toMatchObject({ amount: 11000, amount_refunded: 3000, refunded: false, payment_intent: intentId, metadata: { invoiceId: 'inv_1' } });

    await expect(stripe.refunds.create({ payment_intent: intentId, amount: 9000 })).rejects.toMatchObject({
      type: 'StripeInvalidRequestError',
      code: 'amount_too_large',
    });

    const rest = await stripe.refunds.create({ payment_intent: intentId });
    expect(rest.amount).toBe(8000);
    const second = await receiver.waitFor('charge.refunded', (e) => (e.data.object as Stripe.Charge).refunded);
    expect(second.data.object).toMatchObject({ amount_refunded: 11000, refunded: true });
    expect((await stripe.refunds.retrieve(rest.id)).amount).toBe(8000);

    const over = stripe.refunds.create({ payment_intent: intentId, amount: 100 });
    await expect(over).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(over).rejects.toMatchObject({ code: 'charge_already_refunded', statusCode: 400 });
  });

  it('answers errors in the API shape the SDK maps to its error classes', async () => {
    const wrongKey = sdkFor(fake.port, 'sk_test_wrong_key_123456');
    const denied = wrongKey.customers.list();
    await expect(denied).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    await expect(denied).rejects.toMatchObject({ statusCode: 401, rawType: 'invalid_request_error' });

    const noItems = stripe.checkout.sessions.create({ mode: 'payment', success_url: 'http://127.0.0.1:3000/ok' });
    await expect(noItems).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(noItems).rejects.toMatchObject({ param: 'line_items' });

    const noName = stripe.checkout.sessions.create({
      mode: 'payment',
      success_url: 'http://127.0.0.1:3000/ok',
      line_items: [{ price_data: { currency: 'gbp', unit_amount: 100 } as never, quantity: 1 }],
    });
    await expect(noName).rejects.toMatchObject({ param: 'line_items[0][price_data][product_data]', statusCode: 400 });

    await expect(stripe.paymentIntents.retrieve('pi_missing')).rejects.toMatchObject({ statusCode: 404, code: 'resource_missing' });

    const badPath = await fetch(`${fake.baseUrl}/pay/%E0%A4%A`);
    expect(badPath.status).toBe(400);
    expect((await fetch(`${fake.baseUrl}/_fake/health`)).status).toBe(200);

    const raw = await fetch(`${fake.baseUrl}/v1/nothing-here`, { headers: { authorization: `Bearer ${DEFAULT_SECRET_KEY}` } });
    expect(raw.status).toBe(404);
    expect(await raw.json()).toMatchObject({ error: { type: 'invalid_request_error' } });
    const noAuth = await fetch(`${fake.baseUrl}/v1/customers`);
    expect(noAuth.status).toBe(401);
    expect(await noAuth.json()).toMatchObject({ error: { type: 'invalid_request_error' } });
  });

  it('expands the payment intent and its charge, and expires an open session', async () => {
    const paidSession = await createInvoiceSession();
    await pay(paidSession.id, '4242424242424242');
    const expanded = await stripe.checkout.sessions.retrieve(paidSession.id, { expand: ['payment_intent.latest_charge'] });
    const intent = expanded.payment_intent as Stripe.PaymentIntent;
    expect(intent.object).toBe('payment_intent');
    expect((intent.latest_charge as Stripe.Charge).payment_method_details?.card?.last4).toBe('4242');
    await expect(stripe.checkout.sessions.retrieve(paidSession.id, { expand: ['success_url'] })).rejects.toMatchObject({ param: 'expand' });

    const open = await createInvoiceSession();
    const expired = await stripe.checkout.sessions.expire(open.id);
    expect(expired).toMatchObject({ status: 'expired', url: null });
    await receiver.waitFor('checkout.session.expired');
    expect((await pay(open.id, '4242424242424242')).status).toBe(410);
    await expect(stripe.checkout.sessions.expire(open.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it('accepts a hand-written form body with expand[] and replays an idempotency key', async () => {
    const body =
      'mode=payment&success_url=http%3A%2F%2F127.0.0.1%3A3000%2Fok&customer_email=x%40example.test' +
      '&line_items[0][price_data][currency]=GBP&line_items[0][price_data][unit_amount]=999&line_items[0][price_data][product_data][name]=Gas+check' +
      '&line_items[0][quantity]=3&metadata[invoiceId]=inv_raw&expand[]=line_items';
    const post = (): Promise<Response> =>
      fetch(`${fake.baseUrl}/v1/checkout/sessions`, {
        method: 'POST',
        headers: { authorization: `Bearer ${DEFAULT_SECRET_KEY}`, 'content-type': 'application/x-www-form-urlencoded', 'idempotency-key': 'idem-1' },
        body,
      });
    const first = (await (await post()).json()) as { id: string; amount_total: number; currency: string; metadata: object; line_items: { data: unknown[] } };
    expect(first).toMatchObject({ amount_total: 2997, currency: 'gbp', metadata: { invoiceId: 'inv_raw' } });
    expect(first.line_items.data).toHaveLength(1);
    const replay = await post();
    expect(replay.headers.get('idempotent-replayed')).toBe('true');
    expect(((await replay.json()) as { id: string }).id).toBe(first.id);
  });

  it('retries a failed webhook, lists events and resends on request', async () => {
    receiver.failNext = 2;
    const session = await createInvoiceSession();
    await pay(session.id, '4242424242424242');
    await receiver.waitFor('checkout.session.completed', (e) => (e.data.object as Stripe.Checkout.Session).id === session.id);

    const list = (await (await fetch(`${fake.baseUrl}/_fake/events?type=checkout.session.completed`)).json()) as { data: EventRecord[] };
    const record = list.data.find((r) => (r.event.data.object as { id: string }).id === session.id);
    expect(record?.delivery.status).toBe('delivered');
    expect(record?.delivery.attempts.map((a) => a.status)).toEqual([500, 500, 200]);

    receiver.received = [];
    const resend = await fetch(`${fake.baseUrl}/_fake/resend/${record?.event.id}`, { method: 'POST' });
    expect(resend.status).toBe(200);
    const again = await receiver.waitFor('checkout.session.completed');
    expect(again.id).toBe(record?.event.id);
    expect((await fetch(`${fake.baseUrl}/_fake/resend/evt_nope`, { method: 'POST' })).status).toBe(404);
  });

  it('does not hold the pay page long when the webhook endpoint is down', async () => {
    const down = await startPaymentFake({ port: 0, webhookUrl: 'http://127.0.0.1:9/unreachable', webhookRetryDelaysMs: [20], webhookWaitMs: 500, log: quiet });
    try {
      const sdk = sdkFor(down.port);
      const session = await sdk.checkout.sessions.create({
        mode: 'payment',
        success_url: 'http://127.0.0.1:3000/ok',
        line_items: [{ price_data: { currency: 'gbp', unit_amount: 500, product_data: { name: 'Test' } }, quantity: 1 }],
      });
      const started = Date.now();
      const res = await fetch(`${down.baseUrl}/pay/${session.id}`, {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded' },
        body: 'card_number=4242424242424242',
        redirect: 'manual',
      });
      expect(res.status).toBe(303);
      expect(Date.now() - started).toBeLessThan(2500);
      await expect.poll(() => down.events()[0]?.delivery.status, { timeout: 3000 }).toBe('failed');
      expect(down.events()[0].delivery.attempts).toHaveLength(2);
    } finally {
      await down.close();
    }
  });

  it('keeps state across a restart when given a state file', async () => {
    const dir = await mkdtemp(path.join(os.tmpdir(), 'hearthmark-payment-fake-'));
    const stateFile = path.join(dir, 'state.json');
    try {
      const first = await startPaymentFake({ port: 0, webhookUrl: null, stateFile, log: quiet });
      const session = await sdkFor(first.port).checkout.sessions.create({
        mode: 'payment',
        success_url: 'http://127.0.0.1:3000/ok',
        line_items: [{ price_data: { currency: 'gbp', unit_amount: 4200, product_data: { name: 'Kept' } }, quantity: 1 }],
      });
      await first.close();
      const second = await startPaymentFake({ port: 0, webhookUrl: null, stateFile, log: quiet });
      try {
        const again = await sdkFor(second.port).checkout.sessions.retrieve(session.id);
        expect(again.amount_total).toBe(4200);
      } finally {
        await second.close();
      }
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
