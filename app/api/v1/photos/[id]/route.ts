import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { fileStore } from '@/lib/storage';
import { getPhotoForViewer } from '@/db/photos';

export const runtime = 'nodejs';

// Serves a stored photo only to the engineer of its visit or the office of its organisation;
// anyone else gets the same 404 as for a photo that does not exist.
export const GET = apiRoute<{ id: string }>(['engineer', 'office'], async ({ user, params }) => {
  const photo = await getPhotoForViewer({ id: params.id, user });
  if (!photo) throw new AppError('not_found', 'No such photo.');
  const bytes = await fileStore().get(photo.storageKey);
  if (!bytes) throw new AppError('not_found', 'The photo file is missing.');
  return new Response(new Uint8Array(bytes), {
    headers: {
      'content-type': photo.mime,
      'content-length': String(bytes.length),
      'x-content-type-options': 'nosniff',
      'content-security-policy': "default-src 'none'; sandbox",
      'content-disposition': `inline; filename="${photo.id}.${photo.mime === 'image/png' ? 'png' : 'jpg'}"`,
      'cache-control': 'private, max-age=86400, immutable',
    },
  });
});
