// Invoice arithmetic: the one function that turns lines and a tax rate into totals. Used by the
// invoice writer on the server, the draft preview in the browser, the PDF and the checkout session.

export type LineInput = { quantity: number; unitAmountMinor: number };

export type InvoiceTotals = {
  /** quantity × unit price of each line, in the order given. */
  lineAmountsMinor: number[];
  subtotalMinor: number;
  taxMinor: number;
  totalMinor: number;
};

/** Rates are whole basis points: 2000 = 20 %, 1750 = 17.5 %. */
export const MAX_TAX_RATE_BP = 10_000;

function assertWhole(value: number, what: string, min: number): void {
  if (!Number.isSafeInteger(value) || value < min) throw new RangeError(`${what} must be a whole number of at least ${min}, got ${value}`);
}

/**
 * Rounding rule: every amount is an integer number of minor units. A line is quantity × unit price,
 * exact. Tax is charged ONCE, on the invoice subtotal (not per line), at `taxRateBp` basis points and
 * rounded half up to the nearest minor unit (0.5p becomes 1p, 0.49p becomes 0p). The total is
 * subtotal + tax. So the lines always add up to the subtotal, and the tax differs from the exact
 * figure by at most half a minor unit, however many lines there are.
 */
export function computeInvoiceTotals(input: { lines: readonly LineInput[]; taxRateBp: number }): InvoiceTotals {
  assertWhole(input.taxRateBp, 'taxRateBp', 0);
  if (input.taxRateBp > MAX_TAX_RATE_BP) throw new RangeError(`taxRateBp must be at most ${MAX_TAX_RATE_BP}, got ${input.taxRateBp}`);
  const lineAmountsMinor = input.lines.map((line, i) => {
    assertWhole(line.quantity, `lines[${i}].quantity`, 1);
    assertWhole(line.unitAmountMinor, `lines[${i}].unitAmountMinor`, 0);
    const amount = line.quantity * line.unitAmountMinor;
    if (!Number.isSafeInteger(amount)) throw new RangeError(`lines[${i}] amount is too large`);
    return amount;
  });
  const subtotalMinor = lineAmountsMinor.reduce((sum, amount) => sum + amount, 0);
  const scaled = subtotalMinor * input.taxRateBp;
  if (!Number.isSafeInteger(scaled)) throw new RangeError('invoice subtotal is too large');
  // Integer half-up division by 10 000 (amounts are never negative). Taking the remainder first keeps
  // the division exact even where a float quotient would round across a whole unit.
  const shifted = scaled + 5_000;
  const taxMinor = (shifted - (shifted % 10_000)) / 10_000;
  return { lineAmountsMinor, subtotalMinor, taxMinor, totalMinor: subtotalMinor + taxMinor };
}
