import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { revokeCalendarFeed } from '@/db/schedule';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const DELETE = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  if (!(await revokeCalendarFeed(actorFrom(user), params.id))) throw new AppError('not_found', 'No such calendar feed.');
  return { revoked: true };
});
