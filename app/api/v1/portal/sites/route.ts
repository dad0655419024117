import { apiRoute } from '@/lib/api/handler';
import { siteAudience } from '@/lib/auth/audience';
import { listPortalSites } from '@/db/certificates';

export const runtime = 'nodejs';

// A landlord's (or homeowner's) own sites, each with its current certificate, expiry, open
// remedial findings and whether a renewal is already requested.
export const GET = apiRoute(['landlord', 'homeowner'], async ({ user }) => ({ items: await listPortalSites(siteAudience(user)) }));
