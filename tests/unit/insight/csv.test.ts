// lib/insight CSV: formula-injection safety (OWASP "CSV Injection" guidance: prefix = + - @ tab CR
// with a quote) and RFC 4180 quoting.
import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { safeCell, toCsv } from '@/lib/insight';

describe('safeCell', () => {
  it.each(['=1+1', '+44 7700', '-2+3', '@SUM(A1)', '\tx', '\rx', '=HYPERLINK("http://x","y")'])('prefixes %j with a quote', (value) => {
    expect(safeCell(value)).toBe(`'${value}`);
  });

  it('leaves ordinary text, numbers (negative ones too) and empties alone', () => {
    expect(safeCell('Kitchen cupboard')).toBe('Kitchen cupboard');
    expect(safeCell('a=b')).toBe('a=b');
    expect(safeCell(-3.5)).toBe(-3.5);
    expect(safeCell(null)).toBe('');
    expect(safeCell(Number.NaN)).toBe('');
  });
});

describe('toCsv', () => {
  it('round-trips commas, quotes and newlines, and keeps the guard on formula cells', () => {
    const csv = toCsv({ header: ['a', 'b'], rows: [['x, "quoted"\nline', '=cmd|calc'], [1.25, null]] });
    const parsed = Papa.parse<string[]>(csv.trim(), { newline: '\r\n' }).data;
    expect(parsed).toEqual([['a', 'b'], ['x, "quoted"\nline', "'=cmd|calc"], ['1.25', '']]);
  });
});
