import { apiRoute, parseQuery } from '@/lib/api/handler';
import { auditQuerySchema } from '@/lib/validations/users';
import { listAudit } from '@/db/audit';
import { collectAll, exportQuery } from '@/lib/csv/export';
import { csvResponse, toCsv } from '@/lib/csv';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(exportQuery(req), auditQuerySchema);
  const rows = await collectAll((page, pageSize) => listAudit(user.organisationId, { ...q, page, pageSize }));
  return csvResponse('audit-log.csv', toCsv([
    { header: 'at', value: (a) => a.at },
    { header: 'who', value: (a) => a.actorName },
    { header: 'entity', value: (a) => a.entity },
    { header: 'entity_id', value: (a) => a.entityId },
    { header: 'action', value: (a) => a.action },
    { header: 'summary', value: (a) => a.summary },
    { header: 'before', value: (a) => a.before },
    { header: 'after', value: (a) => a.after },
  ], rows));
});
