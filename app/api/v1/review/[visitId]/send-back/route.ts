import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { idSchema } from '@/lib/validations/list-query';
import { sendBackSchema } from '@/lib/validations/certificates';
import { sendVisitBack } from '@/db/certificates';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

// Returns a submitted visit to the engineer (status on_site) with the office's comment.
export const POST = apiRoute<{ visitId: string }>(['office'], async ({ req, user, params }) => {
  const visitId = idSchema.safeParse(params.visitId);
  if (!visitId.success) throw new AppError('not_found', 'No such visit.');
  const { comment } = await parseJson(req, sendBackSchema);
  return { returned: await sendVisitBack({ actor: actorFrom(user), visitId: visitId.data, comment }) };
});
