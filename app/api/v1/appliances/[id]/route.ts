import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { applianceSchema } from '@/lib/validations/appliances';
import { getAppliance, retireAppliance, updateAppliance } from '@/db/appliances';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  const appliance = await getAppliance(user.organisationId, params.id);
  if (!appliance) throw new AppError('not_found', 'No such appliance.');
  return { appliance };
});

export const PATCH = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  if (!(await getAppliance(user.organisationId, params.id))) throw new AppError('not_found', 'No such appliance.');
  const data = await parseJson(req, applianceSchema);
  const appliance = await updateAppliance(actorFrom(user), params.id, data);
  if (!appliance) throw new AppError('not_found', 'No such appliance.');
  return { appliance };
});

export const DELETE = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  if (!(await retireAppliance(actorFrom(user), params.id))) throw new AppError('not_found', 'No such appliance.');
  return { retired: true };
});
