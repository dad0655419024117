import 'server-only';
// Invoice payments through the card-payment SDK: open a hosted checkout for an invoice, expire it,
// refund. State changes arrive later as signed webhooks (app/api/v1/payments/webhook).
import Stripe from 'stripe';
import { stripe } from './stripe';
import { AppError } from '@/lib/errors';
import type { InvoiceDetail } from '@/db/invoices';

/** SDK failures become our error shape, saying whether anything happened. */
export function paymentServiceError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof Stripe.errors.StripeConnectionError) {
    return new AppError('internal', 'The payment service could not be reached. Nothing was changed; try again in a minute.');
  }
  if (err instanceof Stripe.errors.StripeInvalidRequestError || err instanceof Stripe.errors.StripeCardError) {
    return new AppError('conflict', `The payment service refused this: ${err.message}`);
  }
  console.error('[payments] unexpected payment service error', err);
  return new AppError('internal', 'The payment service answered with an error. Nothing was changed.');
}

/**
 * A hosted checkout page for the invoice's total. The lines go over as they are and the tax as one
 * more line, so the amount charged is the invoice total exactly (tax is computed on the subtotal).
 */
export async function openInvoiceCheckout(input: { invoice: InvoiceDetail; organisationId: string; appUrl: string }): Promise<{ id: string; url: string }> {
  const { invoice, organisationId, appUrl } = input;
  const currency = invoice.currency.toLowerCase();
  const lineItems: Stripe.Checkout.SessionCreateParams.LineItem[] = invoice.lines
    .filter((l) => l.amountMinor > 0)
    .map((l) => ({ quantity: l.quantity, price_data: { currency, unit_amount: l.unitAmountMinor, product_data: { name: l.description } } }));
  if (invoice.taxMinor > 0) {
    lineItems.push({ quantity: 1, price_data: { currency, unit_amount: invoice.taxMinor, product_data: { name: invoice.taxLabel } } });
  }
  const charged = lineItems.reduce((sum, item) => sum + (item.price_data?.unit_amount ?? 0) * (item.quantity ?? 1), 0);
  if (charged !== invoice.totalMinor || charged <= 0) throw new AppError('conflict', 'This invoice has nothing to pay by card.');
  const metadata = { invoiceId: invoice.id, organisationId };
  const back = `${appUrl.replace(/\/+$/, '')}/portal/invoices/${invoice.id}`;
  try {
    const session = await stripe().checkout.sessions.create({
      mode: 'payment',
      line_items: lineItems,
      customer_email: invoice.payerEmail,
      client_reference_id: invoice.id,
      metadata,
      payment_intent_data: { metadata, description: `Invoice ${invoice.numberText}` },
      success_url: `${back}?checkout=done`,
      cancel_url: `${back}?checkout=cancelled`,
    });
    if (!session.url) throw new AppError('internal', 'The payment service did not return a payment page.');
    return { id: session.id, url: session.url };
  } catch (err) {
    throw paymentServiceError(err);
  }
}

/** Closes a checkout page nobody should pay any more (the invoice was voided). Best effort. */
export async function expireCheckout(sessionId: string): Promise<void> {
  try {
    const session = await stripe().checkout.sessions.retrieve(sessionId);
    if (session.status === 'open') await stripe().checkout.sessions.expire(sessionId);
  } catch (err) {
    console.warn('[payments] could not expire checkout session', sessionId, (err as Error).message);
  }
}

/**
 * Asks for a refund of part or all of the card payment. The key makes a double click (same invoice,
 * same refunded-so-far, same amount) one refund, not two.
 */
export async function requestRefund(input: { invoice: InvoiceDetail; organisationId: string; amountMinor: number }): Promise<{ id: string; amountMinor: number }> {
  const { invoice, organisationId, amountMinor } = input;
  if (!invoice.paymentIntentId) throw new AppError('conflict', 'This invoice was not paid by card here, so it cannot be refunded through Hearthmark.');
  try {
    const refund = await stripe().refunds.create(
      { payment_intent: invoice.paymentIntentId, amount: amountMinor, metadata: { invoiceId: invoice.id, organisationId } },
      { idempotencyKey: `refund-${invoice.id}-${invoice.amountRefundedMinor}-${amountMinor}` },
    );
    return { id: refund.id, amountMinor: refund.amount };
  } catch (err) {
    throw paymentServiceError(err);
  }
}
