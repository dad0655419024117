import { apiRoute, parseQuery } from '@/lib/api/handler';
import { ROLES } from '@/lib/auth/roles';
import { siteAudience } from '@/lib/auth/audience';
import { siteListQuerySchema } from '@/lib/validations/sites';
import { listSites } from '@/db/sites';

export const runtime = 'nodejs';

// Office and engineers see the organisation's sites; landlords and homeowners only their own.
export const GET = apiRoute(ROLES, async ({ req, user }) => {
  const query = parseQuery(req, siteListQuerySchema);
  return listSites(siteAudience(user), query);
});
