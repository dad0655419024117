// Input of the review, certificate, delivery and portal endpoints; shared by forms and handlers.
import { z } from 'zod';

const text = (label: string, min: number, max: number) =>
  z
    .string({ message: `${label} is required` })
    .trim()
    .min(min, min > 1 ? `${label} needs at least ${min} characters` : `${label} is required`)
    .max(max, `${label} must be at most ${max} characters`);

const optionalText = (label: string, max: number) =>
  z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? null : v), z.string().trim().max(max, `${label} must be at most ${max} characters`).nullable().optional()).transform((v) => v ?? null);

export const sendBackSchema = z.object({ comment: text('Comment for the engineer', 5, 2000) }).strict();
export type SendBackInput = z.output<typeof sendBackSchema>;

export const issueSchema = z.object({ send: z.boolean().default(true) }).strict();

export const voidSchema = z.object({ reason: text('Reason', 5, 1000), reissue: z.boolean().default(false) }).strict();
export type VoidInput = z.output<typeof voidSchema>;

export const RECIPIENT_KINDS = ['landlord', 'homeowner', 'tenant'] as const;
export const resendSchema = z.object({ recipients: z.array(z.enum(RECIPIENT_KINDS)).min(1, 'Choose at least one recipient').optional() }).strict();

export const CERTIFICATE_STATUSES = ['valid', 'expired', 'void'] as const;
export const certificateListQuerySchema = z
  .object({
    siteId: z.string().uuid('siteId must be an id').optional(),
    status: z.enum(CERTIFICATE_STATUSES, { message: 'status must be valid, expired or void' }).optional(),
    q: z.string().trim().max(100).optional(),
    page: z.coerce.number().int().min(1).max(100000).default(1),
    pageSize: z.coerce.number().int().min(1).max(100).default(50),
  })
  .strict();

export const renewalRequestSchema = z
  .object({
    siteId: z.string({ message: 'Choose a property' }).uuid('Choose a property'),
    note: optionalText('Note', 1000),
    preferredTimes: optionalText('Preferred times', 200),
  })
  .strict();
export type RenewalRequestInput = z.output<typeof renewalRequestSchema>;

export const pdfQuerySchema = z.object({ original: z.enum(['1', 'true']).optional(), download: z.enum(['1', 'true']).optional() }).strict();
