import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { idSchema } from '@/lib/validations/list-query';
import { getReviewBundle } from '@/db/certificates';

export const runtime = 'nodejs';

// Everything recorded on a visit, for the office to review before issuing.
export const GET = apiRoute<{ visitId: string }>(['office'], async ({ user, params }) => {
  const visitId = idSchema.safeParse(params.visitId);
  const bundle = visitId.success ? await getReviewBundle(user.organisationId, visitId.data) : null;
  if (!bundle) throw new AppError('not_found', 'No such visit.');
  return bundle;
});
