import { apiRoute, parseQuery } from '@/lib/api/handler';
import { renewalListQuerySchema } from '@/lib/validations/renewals';
import { listRenewals } from '@/db/reminders';
import { collectAll, exportQuery } from '@/lib/csv/export';
import { csvResponse, toCsv } from '@/lib/csv';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(exportQuery(req), renewalListQuerySchema);
  const rows = await collectAll((page, pageSize) => listRenewals(user.organisationId, { ...q, page, pageSize }));
  return csvResponse('renewals.csv', toCsv([
    { header: 'reference', value: (r) => r.reference },
    { header: 'address', value: (r) => r.address },
    { header: 'town', value: (r) => r.town },
    { header: 'postcode', value: (r) => r.postcode },
    { header: 'last_checked_on', value: (r) => r.lastCheckedOn },
    { header: 'expires_on', value: (r) => r.expiresOn },
    { header: 'state', value: (r) => r.state },
    { header: 'reminder_to', value: (r) => r.recipientEmail },
    { header: 'rule', value: (r) => r.policySource },
  ], rows));
});
