import { apiRoute, parseJson } from '@/lib/api/handler';
import { syncBatchSchema, type SyncResponse } from '@/lib/validations/sync';
import { applySyncBatch } from '@/db/sync';

export const runtime = 'nodejs';

// The field app's outbox posts here. The answer has one result per mutation (applied, duplicate or
// rejected with its reason); a mutation not in the answer (a dropped connection) is simply sent again.
export const POST = apiRoute(['engineer'], async ({ req, user }): Promise<SyncResponse> => {
  const body = await parseJson(req, syncBatchSchema);
  return { results: await applySyncBatch({ user: { id: user.id, organisationId: user.organisationId }, items: body.mutations }) };
});
