import { apiRoute, parseJson } from '@/lib/api/handler';
import { ROLES } from '@/lib/auth/roles';
import { siteAudience } from '@/lib/auth/audience';
import { AppError } from '@/lib/errors';
import { getSite, getSiteDetail, updateSite } from '@/db/sites';
import { siteSchema } from '@/lib/validations/sites';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute<{ id: string }>(ROLES, async ({ user, params }) => {
  // Another organisation's or customer's site answers exactly like a missing one.
  const site = await getSite(siteAudience(user), params.id);
  if (!site) throw new AppError('not_found', 'No such site.');
  return { site };
});

export const PATCH = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  if (!(await getSiteDetail(user.organisationId, params.id))) throw new AppError('not_found', 'No such site.');
  const data = await parseJson(req, siteSchema);
  const site = await updateSite(actorFrom(user), params.id, data);
  if (!site) throw new AppError('not_found', 'No such site.');
  return { site };
});
