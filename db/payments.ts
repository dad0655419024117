import 'server-only';
// The payment service's webhook events: each event id is stored once, in the same transaction that
// applies it to its invoice, so a replayed or concurrent duplicate changes nothing a second time.
import { db } from './knex';
import { nowIso, toIso } from './rows';
import { isUniqueViolation, issueStateOf } from './invoices';
import { deriveInvoiceStatus, mergePaymentEffect, type InvoiceStatus, type PaymentEffect, type PaymentFacts } from '@/lib/billing/status';

export type PaymentEventOutcome = 'applied' | 'ignored' | 'unmatched';

export type InvoicePaymentState = PaymentFacts & { status: InvoiceStatus };

export type ApplyResult =
  | { duplicate: true }
  | { duplicate: false; outcome: PaymentEventOutcome; invoiceId: string | null; before: InvoicePaymentState | null; after: InvoicePaymentState | null };

type Row = Record<string, unknown>;

function factsOf(row: Row): InvoicePaymentState {
  return {
    status: row.status as InvoiceStatus,
    amountPaidMinor: Number(row.amount_paid_minor),
    amountRefundedMinor: Number(row.amount_refunded_minor),
    paidAt: toIso(row.paid_at),
    paymentIntentId: (row.payment_intent_id as string | null) ?? null,
    lastPaymentError: (row.last_payment_error as string | null) ?? null,
    lastPaymentErrorAt: toIso(row.last_payment_error_at),
  };
}

/**
 * Records the event and, when it names one of our invoices, folds its effect into that invoice.
 * `target` comes from the event's metadata; the invoice must belong to the named organisation.
 */
export async function applyPaymentEvent(input: {
  event: { id: string; type: string; createdIso: string; payload: string };
  target: { organisationId: string; invoiceId: string } | null;
  effect: PaymentEffect | null;
}): Promise<ApplyResult> {
  const { event, target, effect } = input;
  try {
    return await db().transaction(async (trx) => {
      // The insert comes first: a second delivery of the same id fails here and rolls back whole.
      await trx('payment_events').insert({
        id: event.id,
        type: event.type,
        organisation_id: target?.organisationId ?? null,
        invoice_id: target?.invoiceId ?? null,
        outcome: 'ignored',
        event_created_at: event.createdIso,
        received_at: nowIso(),
        payload: event.payload,
      });
      if (!target || !effect) return { duplicate: false as const, outcome: 'ignored' as const, invoiceId: null, before: null, after: null };

      const query = trx('invoices').where({ organisation_id: target.organisationId, id: target.invoiceId });
      // PostgreSQL: hold the row while merging; SQLite's single writer already serialises this.
      if (String(trx.client.config.client) === 'pg') query.forUpdate();
      const row: Row | undefined = await query.first();
      if (!row) {
        await trx('payment_events').where({ id: event.id }).update({ outcome: 'unmatched' });
        return { duplicate: false as const, outcome: 'unmatched' as const, invoiceId: null, before: null, after: null };
      }
      const before = factsOf(row);
      const merged = mergePaymentEffect(before, effect);
      const status = deriveInvoiceStatus({
        issueState: issueStateOf(row),
        totalMinor: Number(row.total_minor),
        amountPaidMinor: merged.amountPaidMinor,
        amountRefundedMinor: merged.amountRefundedMinor,
      });
      await trx('invoices')
        .where({ id: target.invoiceId })
        .update({
          status,
          amount_paid_minor: merged.amountPaidMinor,
          amount_refunded_minor: merged.amountRefundedMinor,
          paid_at: merged.paidAt,
          paid_by: merged.amountPaidMinor > 0 ? (row.paid_by ?? 'card') : row.paid_by,
          payment_intent_id: merged.paymentIntentId,
          last_payment_error: merged.lastPaymentError,
          last_payment_error_at: merged.lastPaymentErrorAt,
          updated_at: nowIso(),
        });
      await trx('payment_events').where({ id: event.id }).update({ outcome: 'applied' });
      return { duplicate: false as const, outcome: 'applied' as const, invoiceId: target.invoiceId, before, after: { ...merged, status } };
    });
  } catch (err) {
    if (isUniqueViolation(err)) return { duplicate: true };
    throw err;
  }
}

export type PaymentEventEntry = { id: string; type: string; outcome: PaymentEventOutcome; eventCreatedAt: string; receivedAt: string };

/** The events that reached one invoice, newest first, for the office's invoice page. */
export async function listInvoicePaymentEvents(input: { organisationId: string; invoiceId: string }): Promise<PaymentEventEntry[]> {
  const rows: Row[] = await db()('payment_events')
    .where({ organisation_id: input.organisationId, invoice_id: input.invoiceId })
    .orderBy('received_at', 'desc')
    .select('id', 'type', 'outcome', 'event_created_at', 'received_at');
  return rows.map((r) => ({
    id: String(r.id),
    type: String(r.type),
    outcome: r.outcome as PaymentEventOutcome,
    eventCreatedAt: toIso(r.event_created_at) ?? '',
    receivedAt: toIso(r.received_at) ?? '',
  }));
}
