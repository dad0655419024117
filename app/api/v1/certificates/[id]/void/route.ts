import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { idSchema } from '@/lib/validations/list-query';
import { voidSchema } from '@/lib/validations/certificates';
import { actorFrom } from '@/db/audit';
import { voidAndMaybeReissue } from '@/lib/certificates/issue';

export const runtime = 'nodejs';

// Voids a certificate with a reason (409 if already void). With reissue: true the correction is
// issued at once from the visit's records under a new number, linked to the void one; otherwise the
// visit returns to the review queue to be corrected and issued from there.
export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) throw new AppError('not_found', 'No such certificate.');
  const input = await parseJson(req, voidSchema);
  return voidAndMaybeReissue({ actor: actorFrom(user), certificateId: id.data, reason: input.reason, reissue: input.reissue, appUrl: env().NEXTAUTH_URL });
});
