import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { visitStatusSchema } from '@/lib/validations/visits';
import { changeVisitStatus, getVisit } from '@/db/schedule';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  if (!(await getVisit(user.organisationId, params.id))) throw new AppError('not_found', 'No such visit.');
  const input = await parseJson(req, visitStatusSchema);
  const visit = await changeVisitStatus(actorFrom(user), params.id, input);
  if (!visit) throw new AppError('not_found', 'No such visit.');
  return { visit };
});
