import { apiRoute } from '@/lib/api/handler';
import { ROLES } from '@/lib/auth/roles';
import { siteAudience } from '@/lib/auth/audience';
import { AppError } from '@/lib/errors';
import { getSite } from '@/db/sites';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(ROLES, async ({ user, params }) => {
  // Another organisation's or customer's site answers exactly like a missing one.
  const site = await getSite(siteAudience(user), params.id);
  if (!site) throw new AppError('not_found', 'No such site.');
  return { site };
});
