// Analyser register: form/API schema, list query, and the override an engineer gives when
// choosing an analyser whose calibration is out of date.
import { z } from 'zod';
import { listQuerySchema, optionalId } from './list-query';

const date = (label: string) => z.string({ message: `${label} is required` }).regex(/^\d{4}-\d{2}-\d{2}$/, `${label} must be a date`);

export const ANALYSER_SORTS = ['due', 'serial', 'model', 'calibrated'] as const;
export const analyserListQuerySchema = listQuerySchema(ANALYSER_SORTS, {
  state: z.enum(['ok', 'due_soon', 'overdue'], { message: 'state must be ok, due_soon or overdue' }).optional(),
});
export type AnalyserListQuery = z.infer<typeof analyserListQuerySchema>;

export const analyserSchema = z
  .object({
    serial: z.string({ message: 'Serial is required' }).trim().min(1, 'Serial is required').max(80),
    make: z.string({ message: 'Make is required' }).trim().min(1, 'Make is required').max(120),
    model: z.string({ message: 'Model is required' }).trim().min(1, 'Model is required').max(120),
    calibratedOn: date('Calibration date'),
    calibrationDue: date('Calibration due date'),
    coRangeMaxPpm: z.coerce.number({ message: 'CO range must be a number' }).min(100, 'CO range must be at least 100 ppm').max(100000).default(2000),
    assignedTo: optionalId,
  })
  .refine((a) => a.calibrationDue > a.calibratedOn, { message: 'Due date must be after the calibration date', path: ['calibrationDue'] });
export type AnalyserInput = z.input<typeof analyserSchema>;
export type AnalyserData = z.output<typeof analyserSchema>;

export const analyserOverrideSchema = z.object({
  analyserId: z.string().uuid(),
  visitId: z.string().uuid().nullable().optional(),
  reason: z.string({ message: 'Say why this analyser is used' }).trim().min(10, 'Say why this analyser is used (at least 10 characters)').max(2000),
});
