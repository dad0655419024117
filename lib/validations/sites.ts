// Site list query and site form schemas, shared by the office screens and the API.
import { z } from 'zod';

export const SITE_SORTS = ['reference', 'address', 'town', 'postcode', 'updated'] as const;

export const siteListQuerySchema = z
  .object({
    page: z.coerce.number({ message: 'page must be a whole number from 1' }).int('page must be a whole number from 1').min(1, 'page must be a whole number from 1').max(100000).default(1),
    pageSize: z.coerce.number().int('pageSize must be a whole number from 1 to 100').min(1, 'pageSize must be from 1 to 100').max(100, 'pageSize must be from 1 to 100').default(20),
    q: z.string().trim().max(100, 'q must be at most 100 characters').optional(),
    sort: z.enum(SITE_SORTS, { message: `sort must be one of ${SITE_SORTS.join(', ')}` }).default('reference'),
    dir: z.enum(['asc', 'desc'], { message: 'dir must be asc or desc' }).default('asc'),
  })
  .strict();
export type SiteListQuery = z.infer<typeof siteListQuerySchema>;
