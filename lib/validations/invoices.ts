// Invoice list query, the raise-invoice form, refund and void forms; shared by the office screens,
// the portal and /api/v1/invoices.
import { z } from 'zod';
import { INVOICE_STATUSES } from '@/lib/billing/status';
import { amountMinorSchema } from './prices';

export const INVOICE_SORTS = ['number', 'issued', 'due', 'total', 'status', 'payer'] as const;

export const invoiceListQuerySchema = z
  .object({
    page: z.coerce.number({ message: 'page must be a whole number from 1' }).int('page must be a whole number from 1').min(1, 'page must be a whole number from 1').max(100000).default(1),
    pageSize: z.coerce.number().int('pageSize must be a whole number from 1 to 100').min(1, 'pageSize must be from 1 to 100').max(100, 'pageSize must be from 1 to 100').default(20),
    q: z.string().trim().max(100, 'q must be at most 100 characters').optional(),
    status: z.enum(INVOICE_STATUSES, { message: `status must be one of ${INVOICE_STATUSES.join(', ')}` }).optional(),
    sort: z.enum(INVOICE_SORTS, { message: `sort must be one of ${INVOICE_SORTS.join(', ')}` }).default('number'),
    dir: z.enum(['asc', 'desc'], { message: 'dir must be asc or desc' }).default('desc'),
  })
  .strict();
export type InvoiceListQuery = z.infer<typeof invoiceListQuerySchema>;

export const invoiceExtraSchema = z.object({
  priceId: z.string({ message: 'Choose an extra' }).uuid('Choose an extra'),
  quantity: z.number({ message: 'Enter a quantity' }).int('Enter a whole number').min(1, 'At least 1').max(99, 'At most 99'),
});

/** Raise an invoice from a visit. The payer must be the landlord or homeowner of the visit's site. */
export const createInvoiceSchema = z
  .object({
    visitId: z.string({ message: 'Choose a visit' }).uuid('Choose a visit'),
    payerId: z.string({ message: 'Choose who pays' }).uuid('Choose who pays'),
    extras: z.array(invoiceExtraSchema).max(20, 'At most 20 extras').default([]),
    notes: z
      .string()
      .trim()
      .max(1000, 'Notes must be at most 1000 characters')
      .nullable()
      .optional()
      .transform((v) => (v ? v : null)),
  })
  .strict();
export type CreateInvoiceInput = z.input<typeof createInvoiceSchema>;
export type CreateInvoiceData = z.output<typeof createInvoiceSchema>;

export const refundSchema = z
  .object({
    amountMinor: amountMinorSchema.refine((v) => v >= 1, 'Enter an amount above zero'),
  })
  .strict();
export type RefundData = z.output<typeof refundSchema>;

export const voidSchema = z
  .object({
    reason: z.string({ message: 'Say why the invoice is void' }).trim().min(3, 'Say why the invoice is void').max(400, 'At most 400 characters'),
  })
  .strict();
export type VoidData = z.output<typeof voidSchema>;
