// The price list form and PUT /api/v1/prices body: tax settings plus every price line. Amounts are
// integer minor units; the form converts what is typed ("75.00") before this schema sees it.
import { z } from 'zod';
import { APPLIANCE_PRICE_CODES, BILLABLE_VISIT_KINDS, PRICE_KINDS } from '@/lib/billing/catalogue';
import { MAX_TAX_RATE_BP } from '@/lib/billing/totals';

/** Largest single price: 1 000 000.00 in a two-decimal currency. */
export const MAX_UNIT_AMOUNT_MINOR = 100_000_000;

export const amountMinorSchema = z
  .number({ message: 'Enter an amount like 75.00' })
  .refine((v) => Number.isFinite(v), 'Enter an amount like 75.00')
  .refine((v) => Number.isInteger(v), 'Amounts are whole minor units (pence, cents)')
  .refine((v) => v >= 0, 'An amount cannot be negative')
  .refine((v) => v <= MAX_UNIT_AMOUNT_MINOR, 'That amount is too large');

export const priceItemSchema = z.object({
  id: z.string().uuid('must be an id').nullable().optional(),
  kind: z.enum(PRICE_KINDS, { message: `kind must be one of ${PRICE_KINDS.join(', ')}` }),
  code: z.string().trim().max(40).nullable().optional(),
  name: z.string({ message: 'Name is required' }).trim().min(1, 'Name is required').max(120, 'Name must be at most 120 characters'),
  unitAmountMinor: amountMinorSchema,
  active: z.boolean().default(true),
});

export const priceListSchema = z
  .object({
    taxRateBp: z
      .number({ message: 'Enter a rate like 20 or 17.5' })
      .refine((v) => Number.isInteger(v) && v >= 0 && v <= MAX_TAX_RATE_BP, 'Enter a rate from 0 to 100 with at most two decimals'),
    taxLabel: z.string({ message: 'Tax name is required' }).trim().min(1, 'Tax name is required').max(20, 'Tax name must be at most 20 characters'),
    paymentTermsDays: z.number({ message: 'Enter a number of days' }).int('Enter a whole number of days').min(0, 'Days cannot be negative').max(120, 'At most 120 days'),
    invoicePrefix: z
      .string({ message: 'Prefix is required' })
      .trim()
      .toUpperCase()
      .regex(/^[A-Z0-9]{1,8}$/, 'Use 1 to 8 letters or digits'),
    items: z.array(priceItemSchema).max(200, 'At most 200 prices'),
  })
  .superRefine((list, ctx) => {
    const seen = new Set<string>();
    list.items.forEach((item, i) => {
      const code = item.code ?? null;
      if (item.kind === 'visit' && !(BILLABLE_VISIT_KINDS as readonly string[]).includes(code ?? '')) {
        ctx.addIssue({ code: 'custom', path: ['items', i, 'code'], message: `Visit prices need a visit type: ${BILLABLE_VISIT_KINDS.join(', ')}` });
      }
      if (item.kind === 'appliance' && !(APPLIANCE_PRICE_CODES as readonly string[]).includes(code ?? '')) {
        ctx.addIssue({ code: 'custom', path: ['items', i, 'code'], message: 'Appliance prices need an appliance category or default' });
      }
      if (item.kind === 'extra' && code) {
        ctx.addIssue({ code: 'custom', path: ['items', i, 'code'], message: 'Extras have no code' });
      }
      if (item.kind !== 'extra') {
        const key = `${item.kind}:${code}`;
        if (seen.has(key)) ctx.addIssue({ code: 'custom', path: ['items', i, 'code'], message: 'This type already has a price' });
        seen.add(key);
      }
    });
  });

export type PriceListInput = z.input<typeof priceListSchema>;
export type PriceListData = z.output<typeof priceListSchema>;
