// computeInvoiceTotals: the one place invoice money is added up. Rounding rule under test: lines are
// exact; tax is charged once on the subtotal and rounded half up to the minor unit.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { computeInvoiceTotals } from '@/lib/billing/totals';

describe('computeInvoiceTotals', () => {
  it('adds exact line amounts and charges tax on the subtotal', () => {
    const totals = computeInvoiceTotals({
      lines: [
        { quantity: 1, unitAmountMinor: 7500 },
        { quantity: 3, unitAmountMinor: 2500 },
        { quantity: 2, unitAmountMinor: 1999 },
      ],
      taxRateBp: 2000,
    });
    expect(totals).toEqual({ lineAmountsMinor: [7500, 7500, 3998], subtotalMinor: 18998, taxMinor: 3800, totalMinor: 22798 });
  });

  it('rounds half a penny up and less than half down', () => {
    // 17.5 % of 2 = 0.35p → 0; of 3 = 0.525p → 1; of 10 = 1.75p → 2.
    expect(computeInvoiceTotals({ lines: [{ quantity: 1, unitAmountMinor: 2 }], taxRateBp: 1750 }).taxMinor).toBe(0);
    expect(computeInvoiceTotals({ lines: [{ quantity: 1, unitAmountMinor: 3 }], taxRateBp: 1750 }).taxMinor).toBe(1);
    expect(computeInvoiceTotals({ lines: [{ quantity: 1, unitAmountMinor: 10 }], taxRateBp: 1750 }).taxMinor).toBe(2);
    // 5 % of 10p = exactly 0.5p → 1p (half up, not to even).
    expect(computeInvoiceTotals({ lines: [{ quantity: 1, unitAmountMinor: 10 }], taxRateBp: 500 }).taxMinor).toBe(1);
    // 5 % of 30p = 1.5p → 2p.
    expect(computeInvoiceTotals({ lines: [{ quantity: 1, unitAmountMinor: 30 }], taxRateBp: 500 }).taxMinor).toBe(2);
  });

  it('taxes the subtotal once, not each line (the per-line sum would differ)', () => {
    // Three lines of 0.525p tax each: per line that would round to 3p, on the subtotal it is 2p (1.575p).
    const totals = computeInvoiceTotals({ lines: [1, 2, 3].map(() => ({ quantity: 1, unitAmountMinor: 3 })), taxRateBp: 1750 });
    expect(totals.subtotalMinor).toBe(9);
    expect(totals.taxMinor).toBe(2);
    expect(totals.totalMinor).toBe(11);
  });

  it('handles no lines and a zero rate', () => {
    expect(computeInvoiceTotals({ lines: [], taxRateBp: 2000 })).toEqual({ lineAmountsMinor: [], subtotalMinor: 0, taxMinor: 0, totalMinor: 0 });
    expect(computeInvoiceTotals({ lines: [{ quantity: 2, unitAmountMinor: 4550 }], taxRateBp: 0 }).totalMinor).toBe(9100);
  });

  it('refuses fractions, negatives and impossible rates', () => {
    expect(() => computeInvoiceTotals({ lines: [{ quantity: 1, unitAmountMinor: 10.5 }], taxRateBp: 2000 })).toThrow(RangeError);
    expect(() => computeInvoiceTotals({ lines: [{ quantity: 0, unitAmountMinor: 100 }], taxRateBp: 2000 })).toThrow(/quantity/);
    expect(() => computeInvoiceTotals({ lines: [{ quantity: 1, unitAmountMinor: -1 }], taxRateBp: 2000 })).toThrow(/unitAmountMinor/);
    expect(() => computeInvoiceTotals({ lines: [], taxRateBp: 10001 })).toThrow(/taxRateBp/);
    expect(() => computeInvoiceTotals({ lines: [], taxRateBp: 12.5 })).toThrow(/taxRateBp/);
  });

  it('always: integers, lines add up to the subtotal, tax within half a minor unit of exact, rounding half up', () => {
    const line = fc.record({ quantity: fc.integer({ min: 1, max: 99 }), unitAmountMinor: fc.integer({ min: 0, max: 5_000_000 }) });
    fc.assert(
      fc.property(fc.array(line, { maxLength: 30 }), fc.integer({ min: 0, max: 10_000 }), (lines, taxRateBp) => {
        const t = computeInvoiceTotals({ lines, taxRateBp });
        const sum = t.lineAmountsMinor.reduce((a, b) => a + b, 0);
        expect(sum).toBe(t.subtotalMinor);
        expect(t.totalMinor).toBe(t.subtotalMinor + t.taxMinor);
        for (const v of [t.subtotalMinor, t.taxMinor, t.totalMinor]) expect(Number.isSafeInteger(v)).toBe(true);
        // Exact check in BigInt: 10000·tax − subtotal·rate lies in (−5000, 5000]: half up.
        const diff = BigInt(t.taxMinor) * 10_000n - BigInt(t.subtotalMinor) * BigInt(taxRateBp);
        expect(diff > -5000n && diff <= 5000n).toBe(true);
      }),
      { numRuns: 500 },
    );
  });
});
