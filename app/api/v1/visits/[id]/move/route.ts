import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { visitMoveSchema } from '@/lib/validations/visits';
import { getVisit, rebookVisit } from '@/db/schedule';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  if (!(await getVisit(user.organisationId, params.id))) throw new AppError('not_found', 'No such visit.');
  const data = await parseJson(req, visitMoveSchema);
  const result = await rebookVisit(actorFrom(user), params.id, data);
  if (!result) throw new AppError('not_found', 'No such visit.');
  return result;
});
