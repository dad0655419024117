import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { customerSchema } from '@/lib/validations/customers';
import { getCustomer, updateCustomer } from '@/db/customers';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  const customer = await getCustomer(user.organisationId, params.id);
  if (!customer) throw new AppError('not_found', 'No such customer.');
  return { customer };
});

export const PATCH = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  // Look first so another organisation's id is a 404 before the body is even read.
  if (!(await getCustomer(user.organisationId, params.id))) throw new AppError('not_found', 'No such customer.');
  const data = await parseJson(req, customerSchema);
  const customer = await updateCustomer(actorFrom(user), params.id, data);
  if (!customer) throw new AppError('not_found', 'No such customer.');
  return { customer };
});
