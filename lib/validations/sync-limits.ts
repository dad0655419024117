// Plain limits of POST /api/v1/sync, kept apart from the zod schemas so the phone's outbox can read
// them without loading zod on the field app's first screen.
export const MAX_BATCH_MUTATIONS = 50;
