import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { idSchema } from '@/lib/validations/list-query';
import { getOpenVisitReturn, isVisitAssignedTo } from '@/db/certificates';
import { getVisit } from '@/db/schedule';

export const runtime = 'nodejs';

// The office's comment on a visit it sent back, for the engineer to act on (null when none is open).
export const GET = apiRoute<{ id: string }>(['engineer', 'office'], async ({ user, params }) => {
  const visitId = idSchema.safeParse(params.id);
  if (!visitId.success) throw new AppError('not_found', 'No such visit.');
  if (user.role === 'engineer' && !(await isVisitAssignedTo({ organisationId: user.organisationId, visitId: visitId.data, engineerId: user.id }))) throw new AppError('not_found', 'No such visit.');
  // Another organisation's visit (or none) is a 404 for the office too, not an empty answer.
  if (user.role === 'office' && !(await getVisit(user.organisationId, visitId.data))) throw new AppError('not_found', 'No such visit.');
  return { returned: await getOpenVisitReturn({ organisationId: user.organisationId, visitId: visitId.data }) };
});
