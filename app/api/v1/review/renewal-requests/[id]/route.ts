import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { idSchema } from '@/lib/validations/list-query';
import { closeRenewalRequest } from '@/db/renewal-requests';

export const runtime = 'nodejs';

// The office closes a renewal request once the visit is booked.
export const DELETE = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) throw new AppError('not_found', 'No such request.');
  await closeRenewalRequest({ organisationId: user.organisationId, id: id.data, userId: user.id });
  return { closed: true };
});
