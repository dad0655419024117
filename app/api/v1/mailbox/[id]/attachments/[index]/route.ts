import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { fetchFakeAttachment } from '@/lib/mail/fake-mailbox';

export const runtime = 'nodejs';

// Office only, and only while the local mail fake is configured (fetchFakeAttachment refuses otherwise).
export const GET = apiRoute<{ id: string; index: string }>(['office'], async ({ params }) => {
  const index = Number(params.index);
  if (!Number.isInteger(index) || index < 0 || index > 100) throw new AppError('bad_request', 'index must be a whole number', { index: 'must be a whole number from 0' });
  const upstream = await fetchFakeAttachment(params.id, index);
  if (!upstream.ok) throw new AppError('not_found', 'No such attachment.');
  return new Response(upstream.body, {
    headers: {
      'content-type': upstream.headers.get('content-type') ?? 'application/octet-stream',
      'content-disposition': 'attachment',
      'x-content-type-options': 'nosniff',
    },
  });
});
