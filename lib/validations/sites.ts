// Site list query and site form schemas, shared by the office screens and the API.
import { z } from 'zod';
import { optionalId, optionalText } from './list-query';

export const SITE_SORTS = ['reference', 'address', 'town', 'postcode', 'updated'] as const;

export const siteListQuerySchema = z
  .object({
    page: z.coerce.number({ message: 'page must be a whole number from 1' }).int('page must be a whole number from 1').min(1, 'page must be a whole number from 1').max(100000).default(1),
    pageSize: z.coerce.number().int('pageSize must be a whole number from 1 to 100').min(1, 'pageSize must be from 1 to 100').max(100, 'pageSize must be from 1 to 100').default(20),
    q: z.string().trim().max(100, 'q must be at most 100 characters').optional(),
    sort: z.enum(SITE_SORTS, { message: `sort must be one of ${SITE_SORTS.join(', ')}` }).default('reference'),
    dir: z.enum(['asc', 'desc'], { message: 'dir must be asc or desc' }).default('asc'),
    jurisdictionId: z.string().uuid('jurisdictionId must be an id').optional(),
    customerId: z.string().uuid('customerId must be an id').optional(),
  })
  .strict();
export type SiteListQuery = z.infer<typeof siteListQuerySchema>;

// The site form and API body: landlord and/or homeowner, at least one of them.
export const siteSchema = z
  .object({
    reference: z.string({ message: 'Reference is required' }).trim().min(1, 'Reference is required').max(40, 'Reference must be at most 40 characters'),
    addressLine1: z.string({ message: 'Address is required' }).trim().min(1, 'Address is required').max(200, 'Address must be at most 200 characters'),
    addressLine2: optionalText(200, 'Address line 2'),
    town: z.string({ message: 'Town is required' }).trim().min(1, 'Town is required').max(120, 'Town must be at most 120 characters'),
    postcode: z.string({ message: 'Postcode is required' }).trim().toUpperCase().min(2, 'Postcode is required').max(20, 'Postcode must be at most 20 characters'),
    jurisdictionId: z.string({ message: 'Choose a jurisdiction' }).uuid('Choose a jurisdiction'),
    landlordId: optionalId,
    homeownerId: optionalId,
    tenantName: optionalText(200, 'Tenant name'),
    tenantEmail: z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? null : v), z.string().trim().toLowerCase().email('Enter the tenant’s e-mail or leave it empty').max(254).nullable().optional()).transform((v) => v ?? null),
    tenantPhone: optionalText(40, 'Tenant phone'),
    accessNotes: optionalText(2000, 'Access notes'),
  })
  .refine((s) => s.landlordId || s.homeownerId, { message: 'Choose a landlord or a homeowner (or both)', path: ['landlordId'] });
export type SiteInput = z.input<typeof siteSchema>;
export type SiteData = z.output<typeof siteSchema>;
