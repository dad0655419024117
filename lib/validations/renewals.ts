// Renewals list query and the organisation's reminder settings.
import { z } from 'zod';
import { listQuerySchema } from './list-query';

export const RENEWAL_SORTS = ['expires', 'site', 'town'] as const;
export const renewalListQuerySchema = listQuerySchema(RENEWAL_SORTS, {
  state: z.enum(['due_soon', 'overdue', 'ok', 'none', 'attention'], { message: 'state must be due_soon, overdue, ok, none or attention' }).optional(),
});
export type RenewalListQuery = z.infer<typeof renewalListQuerySchema>;

export const reminderSettingsSchema = z.object({
  offsetsDays: z
    .array(z.coerce.number().int('Offsets are whole days').min(1, 'Offsets are 1 to 365 days').max(365, 'Offsets are 1 to 365 days'))
    .min(1, 'Give at least one offset')
    .max(6, 'At most six offsets')
    .refine((a) => new Set(a).size === a.length, 'Offsets must differ'),
});
