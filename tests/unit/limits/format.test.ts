import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatNumber, formatNumberReference } from '../../../lib/limits/format';

describe('formatNumber', () => {
  it('prints six significant digits with float noise trimmed', () => {
    expect(formatNumber(0.008000000000000002)).toBe('0.008');
    expect(formatNumber(0.0092)).toBe('0.0092');
    expect(formatNumber(0.00135165432)).toBe('0.00135165');
    expect(formatNumber(-155.83333333)).toBe('-155.833');
    expect(formatNumber(1234567)).toBe('1234570');
    expect(formatNumber(0)).toBe('0');
  });

  it('agrees with the toPrecision definition everywhere, ties included', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (value) => formatNumber(value) === formatNumberReference(value)),
      { numRuns: 20_000 },
    );
    for (let i = 0; i < 20_000; i++) {
      const tie = (i + 0.5) / 10 ** (i % 9); // six-digit mantissas ending in 5: the rounding edge
      expect(formatNumber(tie)).toBe(formatNumberReference(tie));
    }
  });
});
