import { NextResponse } from 'next/server';
import Stripe from 'stripe';
import { toErrorResponse } from '@/lib/api/handler';
import { AppError, errorBody } from '@/lib/errors';
import { WEBHOOK_TOLERANCE_S, verifyWebhook } from '@/lib/payments/stripe';
import { readPaymentEvent } from '@/lib/payments/events';
import { notifyPayer } from '@/lib/payments/notify';
import { applyPaymentEvent } from '@/db/payments';

export const runtime = 'nodejs';

function refuse(message: string): NextResponse {
  return NextResponse.json(errorBody(new AppError('bad_request', message)), { status: 400 });
}

// Events from the payment service. No session: the signature over the exact raw body is the
// authentication, so the body is read as text before anything else touches it.
export async function POST(req: Request): Promise<Response> {
  const rawBody = await req.text();
  const signature = req.headers.get('stripe-signature');
  if (!signature) return refuse('The webhook has no signature.');
  let event: Stripe.Event;
  try {
    event = verifyWebhook({ rawBody, signature });
  } catch (err) {
    if (err instanceof Stripe.errors.StripeSignatureVerificationError && /tolerance/i.test(err.message)) {
      return refuse(`The webhook is too old: it was signed more than ${WEBHOOK_TOLERANCE_S} seconds ago.`);
    }
    return refuse('The webhook signature does not match.');
  }
  try {
    const reading = readPaymentEvent(event);
    const result = await applyPaymentEvent({
      event: { id: event.id, type: event.type, createdIso: new Date(event.created * 1000).toISOString(), payload: rawBody },
      ...reading,
    });
    // A replay is acknowledged so the service stops resending it; it changed nothing.
    if (result.duplicate) return NextResponse.json({ received: true, duplicate: true });
    if (result.outcome === 'applied' && reading.target && result.before && result.after) {
      await notifyPayer({ organisationId: reading.target.organisationId, invoiceId: reading.target.invoiceId, before: result.before, after: result.after });
    }
    return NextResponse.json({ received: true, outcome: result.outcome });
  } catch (err) {
    // A 500 makes the service retry later; the event id was not stored, so the retry applies it.
    return toErrorResponse(err);
  }
}
