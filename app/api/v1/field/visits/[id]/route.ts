import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { getFieldBundle } from '@/db/inspections';
import { listFinishedInspections } from '@/db/insight';
import { withTrends } from '@/lib/field/trend';

export const runtime = 'nodejs';

// One visit with its limits, the analyser register and each appliance's trend; another engineer's visit is a 404.
export const GET = apiRoute<{ id: string }>(['engineer'], async ({ user, params }) => {
  if (!/^[0-9a-f-]{36}$/i.test(params.id)) throw new AppError('not_found', 'No such visit among yours.');
  const bundle = await getFieldBundle({ organisationId: user.organisationId, engineerId: user.id, fromIso: '', toIso: '', visitId: params.id });
  if (!bundle) throw new AppError('not_found', 'No such visit among yours.');
  const inspections = await listFinishedInspections({ organisationId: user.organisationId, applianceIds: bundle.visits.flatMap((v) => v.appliances.map((a) => a.id)) });
  return new Response(JSON.stringify(withTrends(bundle, inspections)), { headers: { 'content-type': 'application/json', 'cache-control': 'no-store' } });
});
