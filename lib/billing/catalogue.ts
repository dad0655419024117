// The price list's vocabulary and how a visit becomes draft invoice lines. Pure: the raise-invoice
// form previews with it and the server writes with it.
import { APPLIANCE_CATEGORIES, APPLIANCE_CATEGORY_LABELS, type ApplianceCategory } from '../limits/types';

export const PRICE_KINDS = ['visit', 'appliance', 'extra'] as const;
export type PriceKind = (typeof PRICE_KINDS)[number];

/** The visit types a price list charges for (the visit's `kind`). */
export const BILLABLE_VISIT_KINDS = ['annual_check', 'service', 'breakdown', 'follow_up'] as const;
export type BillableVisitKind = (typeof BILLABLE_VISIT_KINDS)[number];
export const BILLABLE_VISIT_KIND_LABELS: Record<BillableVisitKind, string> = {
  annual_check: 'Annual safety check',
  service: 'Service',
  breakdown: 'Breakdown call-out',
  follow_up: 'Follow-up visit',
};

/** Per-appliance charges are keyed by category; `default` covers categories without their own price. */
export const APPLIANCE_PRICE_CODES = ['default', ...APPLIANCE_CATEGORIES] as const;
export type AppliancePriceCode = (typeof APPLIANCE_PRICE_CODES)[number];
export function appliancePriceLabel(code: AppliancePriceCode): string {
  return code === 'default' ? 'Any other appliance' : APPLIANCE_CATEGORY_LABELS[code];
}

export type PriceItem = {
  id: string;
  kind: PriceKind;
  /** Visit kind, appliance category or `default`; null for extras. */
  code: string | null;
  name: string;
  unitAmountMinor: number;
  active: boolean;
};

export type DraftLine = {
  kind: PriceKind | 'custom';
  priceId: string | null;
  description: string;
  quantity: number;
  unitAmountMinor: number;
};

function isApplianceCategory(value: string): value is ApplianceCategory {
  return (APPLIANCE_CATEGORIES as readonly string[]).includes(value);
}

/**
 * The lines for one visit: the visit charge for its kind, one line per appliance category tested
 * (quantity = how many), then the extras chosen. A category without its own price uses `default`;
 * with neither, the appliance adds no line. Inactive prices are not used.
 */
export function buildVisitLines(input: {
  visitKind: string;
  applianceCategories: readonly string[];
  prices: readonly PriceItem[];
  extras: ReadonlyArray<{ priceId: string; quantity: number }>;
}): { lines: DraftLine[]; missing: string[] } {
  const active = input.prices.filter((p) => p.active);
  const lines: DraftLine[] = [];
  const missing: string[] = [];
  const visitPrice = active.find((p) => p.kind === 'visit' && p.code === input.visitKind);
  if (visitPrice) lines.push({ kind: 'visit', priceId: visitPrice.id, description: visitPrice.name, quantity: 1, unitAmountMinor: visitPrice.unitAmountMinor });
  else missing.push(`visit:${input.visitKind}`);

  const counts = new Map<string, number>();
  for (const category of input.applianceCategories) counts.set(category, (counts.get(category) ?? 0) + 1);
  const fallback = active.find((p) => p.kind === 'appliance' && p.code === 'default');
  for (const category of [...counts.keys()].sort()) {
    const price = active.find((p) => p.kind === 'appliance' && p.code === category) ?? fallback;
    if (!price) {
      missing.push(`appliance:${category}`);
      continue;
    }
    const label = isApplianceCategory(category) ? APPLIANCE_CATEGORY_LABELS[category] : category;
    const description = price.code === 'default' ? `${price.name} (${label.toLowerCase()})` : price.name;
    lines.push({ kind: 'appliance', priceId: price.id, description, quantity: counts.get(category)!, unitAmountMinor: price.unitAmountMinor });
  }

  for (const extra of input.extras) {
    const price = active.find((p) => p.kind === 'extra' && p.id === extra.priceId);
    if (!price) {
      missing.push(`extra:${extra.priceId}`);
      continue;
    }
    lines.push({ kind: 'extra', priceId: price.id, description: price.name, quantity: extra.quantity, unitAmountMinor: price.unitAmountMinor });
  }
  return { lines, missing };
}

/** "KHS-000042": the prefix and the number, zero-padded so they sort as text too. */
export function formatInvoiceNumber(prefix: string, number: number): string {
  return `${prefix}-${String(number).padStart(6, '0')}`;
}
