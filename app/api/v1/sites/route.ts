import { NextResponse } from 'next/server';
import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { ROLES } from '@/lib/auth/roles';
import { siteAudience } from '@/lib/auth/audience';
import { siteListQuerySchema, siteSchema } from '@/lib/validations/sites';
import { createSite, listSites } from '@/db/sites';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

// Office and engineers see the organisation's sites; landlords and homeowners only their own.
export const GET = apiRoute(ROLES, async ({ req, user }) => {
  const query = parseQuery(req, siteListQuerySchema);
  return listSites(siteAudience(user), query);
});

// Only the office registers sites.
export const POST = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, siteSchema);
  return NextResponse.json({ site: await createSite(actorFrom(user), data) }, { status: 201 });
});
