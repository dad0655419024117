import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { idSchema } from '@/lib/validations/list-query';
import { getVisitPhotoRef } from '@/db/certificates';
import { fileStore } from '@/lib/storage';

export const runtime = 'nodejs';

// A visit photo or the occupant's signature, streamed through the session check for the review.
export const GET = apiRoute<{ visitId: string; photoId: string }>(['office'], async ({ user, params }) => {
  const visitId = idSchema.safeParse(params.visitId);
  const photoId = idSchema.safeParse(params.photoId);
  const ref = visitId.success && photoId.success ? await getVisitPhotoRef({ organisationId: user.organisationId, visitId: visitId.data, photoId: photoId.data }) : null;
  const bytes = ref ? await fileStore().get(ref.key) : null;
  if (!ref || !bytes) throw new AppError('not_found', 'No such photo.');
  return new Response(new Uint8Array(bytes), { headers: { 'content-type': ref.mime, 'cache-control': 'private, max-age=3600' } });
});
