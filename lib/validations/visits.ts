// Visit booking (board form, drag-to-rebook and API share this), status changes, board query.
// Times are wall-clock in the organisation's time zone; the server turns them into instants.
import { z } from 'zod';
import { optionalId, optionalText } from './list-query';

export const VISIT_KINDS = ['annual_check', 'service', 'breakdown', 'follow_up'] as const;
export type VisitKind = (typeof VISIT_KINDS)[number];
export const VISIT_KIND_LABELS: Record<VisitKind, string> = {
  annual_check: 'Annual check',
  service: 'Service',
  breakdown: 'Breakdown',
  follow_up: 'Follow-up',
};

const dateSchema = z.string({ message: 'Choose a date' }).regex(/^\d{4}-\d{2}-\d{2}$/, 'Choose a date');
const timeSchema = (label: string) => z.string({ message: `${label} is required` }).regex(/^([01]\d|2[0-3]):[0-5]\d$/, `${label} must be a time like 09:30`);

export const visitSchema = z
  .object({
    siteId: z.string({ message: 'Choose a site' }).uuid('Choose a site'),
    engineerId: optionalId,
    kind: z.enum(VISIT_KINDS, { message: 'Choose the kind of visit' }),
    date: dateSchema,
    startTime: timeSchema('Start'),
    endTime: timeSchema('End'),
    notes: optionalText(2000, 'Notes'),
    followUpOf: optionalId.optional(),
  })
  .refine((v) => v.endTime > v.startTime, { message: 'End must be after start', path: ['endTime'] });
export type VisitInput = z.input<typeof visitSchema>;
export type VisitData = z.output<typeof visitSchema>;

/** Drag-to-rebook sends only what moved; the rest of the booking stays. */
export const visitMoveSchema = z
  .object({
    engineerId: optionalId.optional(),
    date: dateSchema,
    startTime: timeSchema('Start'),
    endTime: timeSchema('End'),
  })
  .refine((v) => v.endTime > v.startTime, { message: 'End must be after start', path: ['endTime'] });

export const visitStatusSchema = z.discriminatedUnion('status', [
  z.object({ status: z.literal('cancelled'), reason: z.string({ message: 'Give a reason' }).trim().min(3, 'Give a reason').max(2000) }),
  z.object({
    status: z.literal('no_access'),
    note: z.string({ message: 'Say what happened' }).trim().min(3, 'Say what happened at the door').max(2000),
    at: z.string().datetime({ offset: true, message: 'at must be an ISO date-time' }).optional(),
  }),
]);
export type VisitStatusInput = z.infer<typeof visitStatusSchema>;

export const boardQuerySchema = z
  .object({
    from: dateSchema,
    days: z.coerce.number().int().min(1, 'days must be 1 to 14').max(14, 'days must be 1 to 14').default(7),
    engineerId: z.string().uuid('engineerId must be an id').optional(),
  })
  .strict();
export type BoardQuery = z.infer<typeof boardQuerySchema>;

export const followUpSchema = z
  .object({
    engineerId: optionalId,
    date: dateSchema,
    startTime: timeSchema('Start'),
    endTime: timeSchema('End'),
    notes: optionalText(2000, 'Notes'),
    findingIds: z.array(z.string().uuid()).max(50).default([]),
  })
  .refine((v) => v.endTime > v.startTime, { message: 'End must be after start', path: ['endTime'] });

export const calendarFeedSchema = z.object({ engineerId: z.string({ message: 'Choose an engineer' }).uuid('Choose an engineer') }).strict();
