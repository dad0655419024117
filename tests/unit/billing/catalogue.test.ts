// buildVisitLines: a visit priced from the list: visit charge, appliances by category, extras.
import { describe, expect, it } from 'vitest';
import { buildVisitLines, formatInvoiceNumber, type PriceItem } from '@/lib/billing/catalogue';

const prices: PriceItem[] = [
  { id: 'v1', kind: 'visit', code: 'annual_check', name: 'Annual safety check', unitAmountMinor: 7500, active: true },
  { id: 'v2', kind: 'visit', code: 'breakdown', name: 'Breakdown call-out', unitAmountMinor: 11000, active: false },
  { id: 'a1', kind: 'appliance', code: 'boiler', name: 'Boiler test', unitAmountMinor: 2500, active: true },
  { id: 'a0', kind: 'appliance', code: 'default', name: 'Appliance test', unitAmountMinor: 1500, active: true },
  { id: 'e1', kind: 'extra', code: null, name: 'CO alarm fitted', unitAmountMinor: 3500, active: true },
];

describe('buildVisitLines', () => {
  it('charges the visit, each category with its count, and the extras', () => {
    const { lines, missing } = buildVisitLines({
      visitKind: 'annual_check',
      applianceCategories: ['boiler', 'cooker', 'boiler'],
      prices,
      extras: [{ priceId: 'e1', quantity: 2 }],
    });
    expect(missing).toEqual([]);
    expect(lines.map((l) => [l.kind, l.description, l.quantity, l.unitAmountMinor])).toEqual([
      ['visit', 'Annual safety check', 1, 7500],
      ['appliance', 'Boiler test', 2, 2500],
      ['appliance', 'Appliance test (cooker / range / oven)', 1, 1500],
      ['extra', 'CO alarm fitted', 2, 3500],
    ]);
  });

  it('reports what has no active price', () => {
    const { lines, missing } = buildVisitLines({ visitKind: 'breakdown', applianceCategories: [], prices, extras: [{ priceId: 'nope', quantity: 1 }] });
    expect(lines).toEqual([]);
    expect(missing).toEqual(['visit:breakdown', 'extra:nope']);
  });

  it('numbers read in order as text', () => {
    expect(formatInvoiceNumber('KHS', 42)).toBe('KHS-000042');
  });
});
