import { apiRoute, parseQuery } from '@/lib/api/handler';
import { siteAudience } from '@/lib/auth/audience';
import { certificateListQuerySchema } from '@/lib/validations/certificates';
import { listCertificates } from '@/db/certificates';

export const runtime = 'nodejs';

// The office sees the organisation's certificates; landlords and homeowners those of their own sites.
export const GET = apiRoute(['office', 'landlord', 'homeowner'], async ({ req, user }) => {
  const query = parseQuery(req, certificateListQuerySchema);
  return listCertificates(siteAudience(user), query);
});
