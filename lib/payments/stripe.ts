import 'server-only';
// The one card-payment SDK client. Where it points comes only from lib/env: the local fake in
// demo, development and tests; the hosted service in production (see lib/env paymentApi).
import Stripe from 'stripe';
import { env } from '@/lib/env';

const holder = globalThis as unknown as { __hearthmarkStripe?: { key: string; client: Stripe } };

export function stripe(): Stripe {
  const e = env();
  // Rebuilt when the settings change (tests point it at a fake on a fresh port).
  const key = [e.STRIPE_SECRET_KEY, e.STRIPE_API_HOST ?? '', e.STRIPE_API_PORT ?? '', e.STRIPE_API_PROTOCOL].join('|');
  if (holder.__hearthmarkStripe?.key !== key) {
    const client = new Stripe(e.STRIPE_SECRET_KEY, {
      ...(e.STRIPE_API_HOST ? { host: e.STRIPE_API_HOST } : {}),
      ...(e.STRIPE_API_PORT !== undefined ? { port: e.STRIPE_API_PORT } : {}),
      protocol: e.STRIPE_API_PROTOCOL,
      // Failures reach the person who clicked at once; refunds carry idempotency keys, so a repeat click is safe.
      maxNetworkRetries: 0,
      telemetry: false,
      timeout: 15_000,
    });
    holder.__hearthmarkStripe = { key, client };
  }
  return holder.__hearthmarkStripe.client;
}

/** How old a signed webhook may be before it is refused as a possible replay. */
export const WEBHOOK_TOLERANCE_S = 300;

/** Verifies the signature and age of a webhook body; throws Stripe's SignatureVerificationError. */
export function verifyWebhook(input: { rawBody: string; signature: string }): Stripe.Event {
  return stripe().webhooks.constructEvent(input.rawBody, input.signature, env().STRIPE_WEBHOOK_SECRET, WEBHOOK_TOLERANCE_S);
}
