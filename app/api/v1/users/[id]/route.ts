import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { userUpdateSchema } from '@/lib/validations/users';
import { getStaffUser, updateStaff } from '@/db/staff';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  const found = await getStaffUser(user.organisationId, params.id);
  if (!found) throw new AppError('not_found', 'No such user.');
  return { user: found };
});

export const PATCH = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  if (!(await getStaffUser(user.organisationId, params.id))) throw new AppError('not_found', 'No such user.');
  const change = await parseJson(req, userUpdateSchema);
  const updated = await updateStaff(actorFrom(user), params.id, change);
  if (!updated) throw new AppError('not_found', 'No such user.');
  return { user: updated };
});
