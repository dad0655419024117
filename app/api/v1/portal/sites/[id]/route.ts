import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { siteAudience } from '@/lib/auth/audience';
import { idSchema } from '@/lib/validations/list-query';
import { listCertificates, listPortalSites } from '@/db/certificates';
import { listRenewalRequests } from '@/db/renewal-requests';

export const runtime = 'nodejs';

// One of the customer's own sites with its whole certificate history; anyone else's is a 404.
export const GET = apiRoute<{ id: string }>(['landlord', 'homeowner'], async ({ user, params }) => {
  const id = idSchema.safeParse(params.id);
  const audience = siteAudience(user);
  const [site] = id.success ? await listPortalSites(audience, id.data) : [];
  if (!site) throw new AppError('not_found', 'No such property.');
  const [certificates, requests] = await Promise.all([listCertificates(audience, { siteId: site.id }), listRenewalRequests(audience, { siteId: site.id })]);
  return { site, certificates: certificates.items, renewalRequests: requests };
});
