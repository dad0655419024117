import { apiRoute, parseQuery } from '@/lib/api/handler';
import { userListQuerySchema } from '@/lib/validations/users';
import { listUsers } from '@/db/staff';
import { collectAll, exportQuery } from '@/lib/csv/export';
import { csvResponse, toCsv } from '@/lib/csv';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(exportQuery(req), userListQuerySchema);
  const rows = await collectAll((page, pageSize) => listUsers(user.organisationId, { ...q, page, pageSize }));
  return csvResponse('users.csv', toCsv([
    { header: 'name', value: (u) => u.name },
    { header: 'email', value: (u) => u.email },
    { header: 'role', value: (u) => u.role },
    { header: 'active', value: (u) => (u.active ? 'yes' : 'no') },
  ], rows));
});
