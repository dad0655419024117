// GET /api/v1/insight/appliances/:id/history — every finished inspection of an appliance with its
// derived figures, the limits in force on each date, the "getting worse" flag and hints. Small JSON
// the field app caches with a visit. ?excludeVisit= leaves out the visit being recorded.
import { z } from 'zod';
import { apiRoute, parseQuery } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { getApplianceHistorySource } from '@/db/insight';
import { buildApplianceHistory } from '@/lib/insight';

const querySchema = z.object({ excludeVisit: z.uuid().optional() }).strict();
const idSchema = z.uuid({ message: 'not an appliance id' });

export const GET = apiRoute<{ id: string }>(['engineer', 'office'], async ({ req, user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) throw new AppError('not_found', 'No such appliance.');
  const query = parseQuery(req, querySchema);
  const source = await getApplianceHistorySource({ organisationId: user.organisationId, applianceId: id.data, excludeVisitId: query.excludeVisit });
  if (!source) throw new AppError('not_found', 'No such appliance.');
  const { siteId, siteReference, siteAddress, ...appliance } = source.appliance;
  return {
    site: { id: siteId, reference: siteReference, address: siteAddress },
    history: buildApplianceHistory({ appliance, inspections: source.inspections, limitContext: source.limitContext }),
  };
});
