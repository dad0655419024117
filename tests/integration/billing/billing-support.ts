// Shared set-up for the billing integration tests: the local mail and payment fakes on free ports,
// an HTTP front for the webhook route handler (so the fake can deliver signed events to it), the
// settings pointed at all three, and builders for signed events.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { startMailFake, type MailFake } from '../../../scripts/fakes/mail-fake';
import { startPaymentFake, type PaymentFake } from '../../../scripts/fakes/payment-fake';
import { listMessages, type MessageSummary } from '../../../scripts/fakes/mail-client';
import { resetEnvCache } from '@/lib/env';
import { demoIds, DEMO_ACCOUNTS } from '@/seeds/demo-support';
import { signInAs } from '../../support/session';
import * as webhookRoute from '@/app/api/v1/payments/webhook/route';

export const WEBHOOK_SECRET = 'whsec_billing_tests_0123456789';
const quiet = (): void => {};

export type BillingFakes = { mail: MailFake; payment: PaymentFake; webhookUrl: string; close: () => Promise<void> };

/** Calls the real route handler with what arrived over HTTP, byte for byte. */
function webhookFront(): http.Server {
  return http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers)) if (typeof v === 'string') headers.set(k, v);
      const request = new Request(`http://localhost:3000${req.url}`, { method: req.method, headers, body: Buffer.concat(chunks) });
      webhookRoute
        .POST(request)
        .then(async (response) => {
          res.writeHead(response.status, { 'content-type': 'application/json' });
          res.end(await response.text());
        })
        .catch((err: Error) => {
          res.writeHead(500).end(err.message);
        });
    });
  });
}

export async function startBillingFakes(): Promise<BillingFakes> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'hearthmark-billing-mail-'));
  const mail = await startMailFake({ smtpPort: 0, httpPort: 0, dir, log: quiet });
  const front = webhookFront();
  await new Promise<void>((resolve) => front.listen(0, '127.0.0.1', resolve));
  const webhookUrl = `http://127.0.0.1:${(front.address() as AddressInfo).port}/api/v1/payments/webhook`;
  const payment = await startPaymentFake({ port: 0, webhookUrl, webhookSecret: WEBHOOK_SECRET, webhookRetryDelaysMs: [], webhookWaitMs: 5000, log: quiet });
  process.env.SMTP_PORT = String(mail.smtpPort);
  process.env.STRIPE_API_HOST = '127.0.0.1';
  process.env.STRIPE_API_PORT = String(payment.port);
  process.env.STRIPE_API_PROTOCOL = 'http';
  process.env.STRIPE_WEBHOOK_SECRET = WEBHOOK_SECRET;
  resetEnvCache();
  return {
    mail,
    payment,
    webhookUrl,
    async close() {
      await payment.close();
      front.closeAllConnections();
      await new Promise<void>((resolve) => front.close(() => resolve()));
      await mail.close();
      await rm(dir, { recursive: true, force: true });
    },
  };
}

export async function mailsTo(fakes: BillingFakes, to: string, subjectIncludes: string): Promise<MessageSummary[]> {
  return (await listMessages(fakes.mail.httpUrl, { to })).filter((m) => m.subject.includes(subjectIncludes));
}

/** Waits until `count` messages to `to` with the subject exist (mail is delivered asynchronously). */
export async function waitForMails(fakes: BillingFakes, input: { to: string; subjectIncludes: string; count: number }): Promise<MessageSummary[]> {
  const until = Date.now() + 5000;
  for (;;) {
    const found = await mailsTo(fakes, input.to, input.subjectIncludes);
    if (found.length >= input.count || Date.now() > until) return found;
    await new Promise((r) => setTimeout(r, 50));
  }
}

const account = (pick: (a: (typeof DEMO_ACCOUNTS)[number]) => boolean) => DEMO_ACCOUNTS.find(pick)!;
export const engineer = account((a) => a.role === 'engineer');
export const office = account((a) => a.role === 'office' && a.org !== 'other');
export const otherOffice = account((a) => a.role === 'office' && a.org === 'other');
export const hal = account((a) => a.email === 'hal.brennick@homes.test');
export const ines = account((a) => a.email === 'ines.varga@homes.test');
export const rory = account((a) => a.email === 'rory.teague@homes.test');
export const landlord = account((a) => a.email === 'dev.anand@harbourline.test');

export function as(user: { id: string; role: 'engineer' | 'office' | 'landlord' | 'homeowner'; org?: 'demo' | 'other'; email?: string }) {
  signInAs({ id: user.id, role: user.role, organisationId: user.org === 'other' ? demoIds.otherOrg : demoIds.org, email: user.email });
}

let sequence = 0;

/** An event shaped like the payment service's, with a fresh id unless one is given. */
export function makeEvent(input: { type: string; object: Record<string, unknown>; id?: string; createdS?: number }): string {
  sequence += 1;
  return JSON.stringify({
    id: input.id ?? `evt_test_${Date.now()}_${sequence}`,
    object: 'event',
    api_version: Stripe.API_VERSION,
    created: input.createdS ?? Math.floor(Date.now() / 1000),
    data: { object: input.object },
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type: input.type,
  });
}

export function signedRequest(payload: string, options: { secret?: string; timestampS?: number; signature?: string | null } = {}): Request {
  const header =
    options.signature === null
      ? null
      : (options.signature ?? Stripe.webhooks.generateTestHeaderString({ payload, secret: options.secret ?? WEBHOOK_SECRET, timestamp: options.timestampS }));
  return new Request('http://localhost:3000/api/v1/payments/webhook', {
    method: 'POST',
    headers: { 'content-type': 'application/json', ...(header ? { 'stripe-signature': header } : {}) },
    body: payload,
  });
}

export function completedSession(input: { invoiceId: string; amountMinor: number; paymentIntent?: string; organisationId?: string }) {
  return {
    id: `cs_test_${input.invoiceId.slice(0, 8)}`,
    object: 'checkout.session',
    amount_total: input.amountMinor,
    amount_subtotal: input.amountMinor,
    currency: 'gbp',
    mode: 'payment',
    payment_status: 'paid',
    status: 'complete',
    payment_intent: input.paymentIntent ?? `pi_test_${input.invoiceId.slice(0, 8)}`,
    metadata: { invoiceId: input.invoiceId, organisationId: input.organisationId ?? demoIds.org },
  };
}

export function refundedCharge(input: { invoiceId: string; amountMinor: number; refundedMinor: number; paymentIntent?: string }) {
  return {
    id: `ch_test_${input.invoiceId.slice(0, 8)}`,
    object: 'charge',
    amount: input.amountMinor,
    amount_captured: input.amountMinor,
    amount_refunded: input.refundedMinor,
    created: Math.floor(Date.now() / 1000) - 60,
    currency: 'gbp',
    paid: true,
    refunded: input.refundedMinor >= input.amountMinor,
    status: 'succeeded',
    payment_intent: input.paymentIntent ?? `pi_test_${input.invoiceId.slice(0, 8)}`,
    metadata: { invoiceId: input.invoiceId, organisationId: demoIds.org },
  };
}
