import { apiRoute, parseQuery } from '@/lib/api/handler';
import { siteListQuerySchema } from '@/lib/validations/sites';
import { listSites } from '@/db/sites';
import { collectAll, exportQuery } from '@/lib/csv/export';
import { csvResponse, toCsv } from '@/lib/csv';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(exportQuery(req), siteListQuerySchema);
  const rows = await collectAll((page, pageSize) => listSites({ organisationId: user.organisationId }, { ...q, page, pageSize }));
  return csvResponse('sites.csv', toCsv([
    { header: 'reference', value: (s) => s.reference },
    { header: 'address_line1', value: (s) => s.addressLine1 },
    { header: 'address_line2', value: (s) => s.addressLine2 },
    { header: 'town', value: (s) => s.town },
    { header: 'postcode', value: (s) => s.postcode },
    { header: 'jurisdiction', value: (s) => s.jurisdictionName },
    { header: 'landlord', value: (s) => s.landlordName },
    { header: 'homeowner', value: (s) => s.homeownerName },
    { header: 'tenant_name', value: (s) => s.tenantName },
    { header: 'appliances', value: (s) => s.applianceCount },
  ], rows));
});
