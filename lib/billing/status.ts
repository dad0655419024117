// Invoice states and how payment facts move them. Pure: the webhook writer, the office tables and
// the tests share it. The payment service's events can arrive late, twice or out of order, so
// payments and refunds are merged as running maxima and the state is derived from them, never
// stepped event by event.

export const INVOICE_STATUSES = ['draft', 'sent', 'paid', 'partly_refunded', 'refunded', 'void'] as const;
export type InvoiceStatus = (typeof INVOICE_STATUSES)[number];

export const INVOICE_STATUS_LABELS: Record<InvoiceStatus, string> = {
  draft: 'Draft',
  sent: 'Unpaid',
  paid: 'Paid',
  partly_refunded: 'Part refunded',
  refunded: 'Refunded',
  void: 'Void',
};

/** What the office did to the invoice itself, before any money moved. */
export type IssueState = 'draft' | 'sent' | 'void';

export type PaymentFacts = {
  amountPaidMinor: number;
  amountRefundedMinor: number;
  paidAt: string | null;
  paymentIntentId: string | null;
  lastPaymentError: string | null;
  lastPaymentErrorAt: string | null;
};

export type PaymentEffect =
  | { kind: 'paid'; amountMinor: number; paymentIntentId: string | null; atIso: string }
  /** A refund event carries the charge's running totals, not just the latest refund. */
  | { kind: 'refunded'; amountPaidMinor: number; amountRefundedMinor: number; paymentIntentId: string | null; atIso: string }
  | { kind: 'failed'; message: string; atIso: string };

export function deriveInvoiceStatus(input: { issueState: IssueState; totalMinor: number; amountPaidMinor: number; amountRefundedMinor: number }): InvoiceStatus {
  const { issueState, totalMinor, amountPaidMinor, amountRefundedMinor } = input;
  // Money that was taken always shows, even on an invoice voided while the payer was at the pay page.
  if (amountPaidMinor > 0 && amountRefundedMinor >= amountPaidMinor) return 'refunded';
  if (amountPaidMinor > 0 && amountRefundedMinor > 0) return 'partly_refunded';
  if (amountPaidMinor > 0 && amountPaidMinor >= totalMinor) return 'paid';
  return issueState;
}

/** Folds one payment event into the facts; applying the same event again changes nothing. */
export function mergePaymentEffect(current: PaymentFacts, effect: PaymentEffect): PaymentFacts {
  switch (effect.kind) {
    case 'paid':
      return {
        ...current,
        amountPaidMinor: Math.max(current.amountPaidMinor, effect.amountMinor),
        paidAt: current.paidAt ?? effect.atIso,
        paymentIntentId: current.paymentIntentId ?? effect.paymentIntentId,
        lastPaymentError: null,
        lastPaymentErrorAt: null,
      };
    case 'refunded':
      // A refund proves the payment even when its own event has not arrived yet.
      return {
        ...current,
        amountPaidMinor: Math.max(current.amountPaidMinor, effect.amountPaidMinor),
        amountRefundedMinor: Math.max(current.amountRefundedMinor, effect.amountRefundedMinor),
        paidAt: current.paidAt ?? effect.atIso,
        paymentIntentId: current.paymentIntentId ?? effect.paymentIntentId,
        lastPaymentError: null,
        lastPaymentErrorAt: null,
      };
    case 'failed':
      // A decline that arrives after the payment went through is old news.
      if (current.amountPaidMinor > 0) return current;
      if (current.lastPaymentErrorAt && current.lastPaymentErrorAt > effect.atIso) return current;
      return { ...current, lastPaymentError: effect.message, lastPaymentErrorAt: effect.atIso };
  }
}

/** How much of the payment can still be refunded. */
export function refundableMinor(facts: Pick<PaymentFacts, 'amountPaidMinor' | 'amountRefundedMinor'>): number {
  return Math.max(0, facts.amountPaidMinor - facts.amountRefundedMinor);
}
