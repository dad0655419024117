import { apiRoute, parseQuery } from '@/lib/api/handler';
import { boardQuerySchema } from '@/lib/validations/visits';
import { listBoard } from '@/db/schedule';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(req, boardQuerySchema);
  return listBoard({ organisationId: user.organisationId, from: q.from, days: q.days, engineerId: q.engineerId });
});
