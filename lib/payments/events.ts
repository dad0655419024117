// Reads a verified payment-service event: which of our invoices it concerns (from the metadata we
// set when opening the checkout) and what it means for that invoice. No I/O.
import type Stripe from 'stripe';
import type { PaymentEffect } from '@/lib/billing/status';

export const HANDLED_EVENT_TYPES = ['checkout.session.completed', 'charge.refunded', 'payment_intent.payment_failed'] as const;

export type EventReading = {
  target: { organisationId: string; invoiceId: string } | null;
  effect: PaymentEffect | null;
};

const DECLINED = 'The card payment did not go through. Nothing was charged.';

function targetOf(metadata: Stripe.Metadata | null | undefined): EventReading['target'] {
  const invoiceId = metadata?.invoiceId;
  const organisationId = metadata?.organisationId;
  return invoiceId && organisationId ? { invoiceId, organisationId } : null;
}

function idOf(value: string | { id: string } | null | undefined): string | null {
  if (!value) return null;
  return typeof value === 'string' ? value : value.id;
}

function iso(unixSeconds: number): string {
  return new Date(unixSeconds * 1000).toISOString();
}

export function readPaymentEvent(event: Stripe.Event): EventReading {
  switch (event.type) {
    case 'checkout.session.completed': {
      const session = event.data.object;
      const target = targetOf(session.metadata);
      // Only card payments are offered, so a completed session is paid; anything else waits.
      if (session.payment_status !== 'paid' || session.amount_total === null) return { target, effect: null };
      return { target, effect: { kind: 'paid', amountMinor: session.amount_total, paymentIntentId: idOf(session.payment_intent), atIso: iso(event.created) } };
    }
    case 'charge.refunded': {
      const charge = event.data.object;
      return {
        target: targetOf(charge.metadata),
        effect: {
          kind: 'refunded',
          amountPaidMinor: charge.amount_captured,
          amountRefundedMinor: charge.amount_refunded,
          paymentIntentId: idOf(charge.payment_intent),
          atIso: iso(charge.created),
        },
      };
    }
    case 'payment_intent.payment_failed': {
      const intent = event.data.object;
      const message = intent.last_payment_error?.message ? `${intent.last_payment_error.message} Nothing was charged.` : DECLINED;
      return { target: targetOf(intent.metadata), effect: { kind: 'failed', message, atIso: iso(event.created) } };
    }
    default:
      return { target: null, effect: null };
  }
}
