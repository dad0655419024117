// Money text in and out: minor units per currency, typed amounts parsed without floating point.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatMoney, formatRatePct, minorDigits, parseMoneyInput, parseRatePct, toMajorText } from '@/lib/billing/money';

describe('money', () => {
  it('knows each currency’s minor digits', () => {
    expect(minorDigits('GBP')).toBe(2);
    expect(minorDigits('eur')).toBe(2);
    expect(minorDigits('JPY')).toBe(0);
    expect(minorDigits('KWD')).toBe(3);
  });

  it('formats minor units', () => {
    expect(formatMoney(123450, 'GBP')).toBe('£1,234.50');
    expect(formatMoney(5, 'GBP')).toBe('£0.05');
    expect(formatMoney(1200, 'JPY')).toBe('JP¥1,200');
    expect(toMajorText(7505, 'GBP')).toBe('75.05');
    expect(toMajorText(1200, 'JPY')).toBe('1200');
  });

  it('parses what people type, refusing what is not an amount', () => {
    expect(parseMoneyInput('75', 'GBP')).toBe(7500);
    expect(parseMoneyInput('75.5', 'GBP')).toBe(7550);
    expect(parseMoneyInput(' £1,075.05 ', 'GBP')).toBe(107505);
    expect(parseMoneyInput('0.1', 'GBP')).toBe(10);
    expect(parseMoneyInput('1200', 'JPY')).toBe(1200);
    for (const bad of ['', 'abc', '1.234', '-5', '1e3', '12.3.4']) expect(parseMoneyInput(bad, 'GBP')).toBeNaN();
    expect(parseMoneyInput('12.5', 'JPY')).toBeNaN();
  });

  it('round-trips every amount through text', () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 999_999_999 }), (minor) => parseMoneyInput(toMajorText(minor, 'GBP'), 'GBP') === minor));
  });

  it('shows and parses tax rates in basis points', () => {
    expect(formatRatePct(2000)).toBe('20');
    expect(formatRatePct(1750)).toBe('17.5');
    expect(formatRatePct(525)).toBe('5.25');
    expect(parseRatePct('17.5')).toBe(1750);
    expect(parseRatePct('20 %')).toBe(2000);
    expect(parseRatePct('5.255')).toBeNaN();
    fc.assert(fc.property(fc.integer({ min: 0, max: 10_000 }), (bp) => parseRatePct(formatRatePct(bp)) === bp));
  });
});
