// Invoice state from payment facts: events can come twice or out of order and still end right.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { deriveInvoiceStatus, mergePaymentEffect, refundableMinor, type PaymentEffect, type PaymentFacts } from '@/lib/billing/status';

const none: PaymentFacts = { amountPaidMinor: 0, amountRefundedMinor: 0, paidAt: null, paymentIntentId: null, lastPaymentError: null, lastPaymentErrorAt: null };
const paid: PaymentEffect = { kind: 'paid', amountMinor: 9000, paymentIntentId: 'pi_1', atIso: '2026-12-02T10:00:00.000Z' };
const refund1: PaymentEffect = { kind: 'refunded', amountPaidMinor: 9000, amountRefundedMinor: 2000, paymentIntentId: 'pi_1', atIso: '2026-12-02T10:00:00.000Z' };
const refund2: PaymentEffect = { kind: 'refunded', amountPaidMinor: 9000, amountRefundedMinor: 9000, paymentIntentId: 'pi_1', atIso: '2026-12-02T10:00:00.000Z' };
const failed: PaymentEffect = { kind: 'failed', message: 'Your card was declined.', atIso: '2026-12-02T09:59:00.000Z' };

function statusAfter(effects: PaymentEffect[], issueState: 'draft' | 'sent' | 'void' = 'sent') {
  const facts = effects.reduce(mergePaymentEffect, none);
  return { facts, status: deriveInvoiceStatus({ issueState, totalMinor: 9000, ...facts }) };
}

describe('invoice status', () => {
  it('follows the usual order', () => {
    expect(statusAfter([]).status).toBe('sent');
    expect(statusAfter([failed]).status).toBe('sent');
    expect(statusAfter([failed]).facts.lastPaymentError).toMatch(/declined/);
    expect(statusAfter([failed, paid]).status).toBe('paid');
    expect(statusAfter([failed, paid]).facts.lastPaymentError).toBeNull();
    expect(statusAfter([paid, refund1]).status).toBe('partly_refunded');
    expect(statusAfter([paid, refund1, refund2]).status).toBe('refunded');
  });

  it('a refund seen before its payment still ends refunded, and the late payment changes nothing', () => {
    const early = statusAfter([refund2]);
    expect(early.status).toBe('refunded');
    expect(statusAfter([refund2, paid])).toEqual(early);
  });

  it('a decline arriving after the payment is ignored', () => {
    expect(statusAfter([paid, failed]).facts.lastPaymentError).toBeNull();
    expect(statusAfter([paid, failed]).status).toBe('paid');
  });

  it('money taken shows even on a void invoice', () => {
    expect(statusAfter([], 'void').status).toBe('void');
    expect(statusAfter([paid], 'void').status).toBe('paid');
  });

  it('any order and any repetition of the same events gives the same end state', () => {
    const all = [paid, refund1, refund2, failed];
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: all.length - 1 }), { minLength: 1, maxLength: 12 }), (picks) => {
        const sequence = picks.map((i) => all[i]);
        const distinct = [...new Set(picks)].map((i) => all[i]);
        // Applying each event once in its first-seen order equals applying the repeated sequence.
        expect(statusAfter(sequence).status).toBe(statusAfter(distinct).status);
        const sorted = [...new Set(picks)].sort().map((i) => all[i]);
        expect(statusAfter(sequence).status).toBe(statusAfter(sorted).status);
      }),
    );
    expect(refundableMinor({ amountPaidMinor: 9000, amountRefundedMinor: 2000 })).toBe(7000);
  });
});
