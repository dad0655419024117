import { apiRoute, parseQuery } from '@/lib/api/handler';
import { applianceListQuerySchema } from '@/lib/validations/appliances';
import { listAppliances } from '@/db/appliances';
import { collectAll, exportQuery } from '@/lib/csv/export';
import { csvResponse, toCsv } from '@/lib/csv';

export const runtime = 'nodejs';

// Same columns as the import, so an export can be edited and imported elsewhere.
export const GET = apiRoute(['office'], async ({ req, user }) => {
  const q = parseQuery(exportQuery(req), applianceListQuerySchema);
  const rows = await collectAll((page, pageSize) => listAppliances(user.organisationId, { ...q, page, pageSize }));
  return csvResponse('appliances.csv', toCsv([
    { header: 'site_reference', value: (a) => a.siteReference },
    { header: 'category', value: (a) => a.category },
    { header: 'fuel', value: (a) => a.fuel },
    { header: 'flue_type', value: (a) => a.flueType },
    { header: 'location', value: (a) => a.location },
    { header: 'make', value: (a) => a.make },
    { header: 'model', value: (a) => a.model },
    { header: 'serial', value: (a) => a.serial },
    { header: 'rated_input_kw', value: (a) => a.ratedInputKw },
    { header: 'mfr_ratio_max', value: (a) => a.mfrRatioMax },
    { header: 'mfr_co_air_free_max_ppm', value: (a) => a.mfrCoAirFreeMaxPpm },
    { header: 'mfr_co_max_ppm', value: (a) => a.mfrCoMaxPpm },
  ], rows));
});
