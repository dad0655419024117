// Builds the list query schema every office table shares: page, pageSize, q, sort, dir, plus
// list-specific filters. Unknown parameters are refused so typos surface as 400s.
import { z } from 'zod';

export function listQuerySchema<const S extends readonly [string, ...string[]], F extends z.ZodRawShape = Record<never, never>>(sorts: S, filters?: F) {
  return z
    .object({
      page: z.coerce.number({ message: 'page must be a whole number from 1' }).int('page must be a whole number from 1').min(1, 'page must be a whole number from 1').max(100000).default(1),
      pageSize: z.coerce.number().int('pageSize must be a whole number from 1 to 100').min(1, 'pageSize must be from 1 to 100').max(100, 'pageSize must be from 1 to 100').default(20),
      q: z.string().trim().max(100, 'q must be at most 100 characters').optional(),
      sort: z.enum(sorts, { message: `sort must be one of ${sorts.join(', ')}` }).default(sorts[0] as S[number] as never),
      dir: z.enum(['asc', 'desc'], { message: 'dir must be asc or desc' }).default('asc'),
      ...(filters ?? ({} as F)),
    })
    .strict();
}

/** Optional text: blank strings become null so forms and CSV rows can leave a field empty. */
export function optionalText(max: number, label: string) {
  return z.preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? null : typeof v === 'string' ? v.trim() : v),
    z.string().max(max, `${label} must be at most ${max} characters`).nullable().optional(),
  ).transform((v) => v ?? null);
}

export function requiredText(max: number, label: string) {
  return z.string({ message: `${label} is required` }).trim().min(1, `${label} is required`).max(max, `${label} must be at most ${max} characters`);
}

export function optionalNumber(label: string, opts: { min: number; max: number }) {
  return z.preprocess(
    (v) => (v === '' || v === null || v === undefined || (typeof v === 'number' && Number.isNaN(v)) ? null : typeof v === 'string' ? Number(v) : v),
    z.number({ message: `${label} must be a number` }).min(opts.min, `${label} must be at least ${opts.min}`).max(opts.max, `${label} must be at most ${opts.max}`).nullable(),
  );
}

export const idSchema = z.string().trim().uuid('must be an id');
export const optionalId = z.preprocess((v) => (v === '' || v === undefined ? null : v), z.string().uuid('must be an id').nullable());

export function escapeLike(q: string): string {
  return `%${q.toLowerCase().replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
}
