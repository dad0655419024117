import { apiRoute, parseQuery } from '@/lib/api/handler';
import { analyserListQuerySchema } from '@/lib/validations/analysers';
import { listAnalysers } from '@/db/analysers';
import { collectAll, exportQuery } from '@/lib/csv/export';
import { csvResponse, toCsv } from '@/lib/csv';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(exportQuery(req), analyserListQuerySchema);
  const rows = await collectAll((page, pageSize) => listAnalysers(user.organisationId, { ...q, page, pageSize }));
  return csvResponse('analysers.csv', toCsv([
    { header: 'serial', value: (a) => a.serial },
    { header: 'make', value: (a) => a.make },
    { header: 'model', value: (a) => a.model },
    { header: 'calibrated_on', value: (a) => a.calibratedOn },
    { header: 'calibration_due', value: (a) => a.calibrationDue },
    { header: 'state', value: (a) => a.status.state },
    { header: 'held_by', value: (a) => a.assignedName },
  ], rows));
});
