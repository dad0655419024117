// The offline outbox's wire format: POST /api/v1/sync takes a batch of mutations, each with a
// client-made id so the server applies it exactly once, and answers one result per mutation.
import { z } from 'zod';
import { MAX_BATCH_MUTATIONS } from './sync-limits';
import { VERDICT_LEVELS } from '../limits/types';
import {
  applianceDetailsSchema,
  findingSchema,
  inspectionSaveSchema,
  makeSafeSchema,
  noAccessSchema,
  readingRecordSchema,
  roomCheckSchema,
  signoffSchema,
  tightnessSchema,
} from './inspection';

const uuid = (label: string) => z.string({ message: `${label} is required` }).uuid(`${label} must be an id`);
const isoTime = (label: string) => z.iso.datetime({ offset: true, message: `${label} must be a date and time` });
const level = z.enum(VERDICT_LEVELS);

export const submitSchema = z.object({
  clientVerdicts: z.object({
    overall: level,
    appliances: z.record(uuid('Appliance'), level),
    installation: level.nullable(),
  }),
});
export type SubmitPayload = z.output<typeof submitSchema>;

/** Each kind and the payload it carries. */
export const MUTATION_PAYLOADS = {
  'visit.arrive': z.object({ arrivedAt: isoTime('Arrival time') }),
  'appliance.add': z.object({ applianceId: uuid('Appliance'), details: applianceDetailsSchema }),
  'inspection.save': inspectionSaveSchema,
  'reading.record': readingRecordSchema,
  'roomCheck.save': roomCheckSchema,
  'roomCheck.remove': z.object({ roomCheckId: uuid('Room check') }),
  'tightness.save': tightnessSchema,
  'finding.save': findingSchema,
  'finding.remove': z.object({ findingId: uuid('Finding') }),
  'makeSafe.save': makeSafeSchema,
  'signoff.save': signoffSchema,
  'visit.noAccess': noAccessSchema,
  'visit.submit': submitSchema,
} as const;

export type MutationKind = keyof typeof MUTATION_PAYLOADS;
export const MUTATION_KINDS = Object.keys(MUTATION_PAYLOADS) as MutationKind[];

const envelope = z.object({
  id: uuid('Mutation id'),
  visitId: uuid('Visit'),
  /** When the engineer made the change, by the device's clock. */
  at: isoTime('at'),
});

function variant<K extends MutationKind>(kind: K) {
  return envelope.extend({ kind: z.literal(kind), payload: MUTATION_PAYLOADS[kind] as (typeof MUTATION_PAYLOADS)[K] });
}

export const mutationSchema = z.discriminatedUnion('kind', [
  variant('visit.arrive'),
  variant('appliance.add'),
  variant('inspection.save'),
  variant('reading.record'),
  variant('roomCheck.save'),
  variant('roomCheck.remove'),
  variant('tightness.save'),
  variant('finding.save'),
  variant('finding.remove'),
  variant('makeSafe.save'),
  variant('signoff.save'),
  variant('visit.noAccess'),
  variant('visit.submit'),
]);
export type Mutation = z.output<typeof mutationSchema>;
export type MutationInput = z.input<typeof mutationSchema>;
export type MutationOf<K extends MutationKind> = Extract<Mutation, { kind: K }>;

export { MAX_BATCH_MUTATIONS };

/** The batch is checked loosely so that one bad item is reported on its own, not as a failed batch. */
export const syncBatchSchema = z
  .object({
    mutations: z
      .array(z.object({ id: z.unknown() }).passthrough(), { message: 'mutations must be a list' })
      .min(1, 'mutations must not be empty')
      .max(MAX_BATCH_MUTATIONS, `at most ${MAX_BATCH_MUTATIONS} mutations per batch`),
  })
  .strict();

export type MutationResult =
  | { id: string; status: 'applied' | 'duplicate'; conflict?: boolean; warnings?: string[] }
  | { id: string; status: 'rejected'; httpStatus: number; code: string; message: string; fields?: Record<string, string> };

export type SyncResponse = { results: MutationResult[] };
