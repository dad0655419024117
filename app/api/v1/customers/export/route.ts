import { apiRoute, parseQuery } from '@/lib/api/handler';
import { customerListQuerySchema } from '@/lib/validations/customers';
import { listCustomers } from '@/db/customers';
import { collectAll, exportQuery } from '@/lib/csv/export';
import { csvResponse, toCsv } from '@/lib/csv';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(exportQuery(req), customerListQuerySchema);
  const rows = await collectAll((page, pageSize) => listCustomers(user.organisationId, { ...q, page, pageSize }));
  return csvResponse('customers.csv', toCsv([
    { header: 'type', value: (c) => c.role },
    { header: 'name', value: (c) => c.name },
    { header: 'email', value: (c) => c.email },
    { header: 'phone', value: (c) => c.phone },
    { header: 'sites', value: (c) => c.siteCount },
  ], rows));
});
