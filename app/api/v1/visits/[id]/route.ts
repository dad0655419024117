import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { visitSchema } from '@/lib/validations/visits';
import { getVisit, listOpenFindings, rebookVisit } from '@/db/schedule';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  const visit = await getVisit(user.organisationId, params.id);
  if (!visit) throw new AppError('not_found', 'No such visit.');
  return { visit, openFindings: await listOpenFindings(user.organisationId, params.id) };
});

/** The edit form: the accessible way to re-book (the board's drag does the same through /move). */
export const PATCH = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  if (!(await getVisit(user.organisationId, params.id))) throw new AppError('not_found', 'No such visit.');
  const data = await parseJson(req, visitSchema);
  const result = await rebookVisit(actorFrom(user), params.id, data);
  if (!result) throw new AppError('not_found', 'No such visit.');
  return result;
});
