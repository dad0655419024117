import { apiRoute } from '@/lib/api/handler';
import { getFieldBundle } from '@/db/inspections';
import { listFinishedInspections } from '@/db/insight';
import { withTrends } from '@/lib/field/trend';

export const runtime = 'nodejs';

const DAYS_AHEAD = 14;

// The signed-in engineer's visits from the start of today (UTC) for two weeks, plus any still open
// from before, with everything needed to record them offline: limits, analysers, and each
// appliance's previous results with its "getting worse" flag.
export const GET = apiRoute(['engineer'], async ({ user }) => {
  const start = new Date();
  start.setUTCHours(0, 0, 0, 0);
  const end = new Date(start.getTime() + DAYS_AHEAD * 86400_000);
  const bundle = await getFieldBundle({ organisationId: user.organisationId, engineerId: user.id, fromIso: start.toISOString(), toIso: end.toISOString() });
  const inspections = await listFinishedInspections({ organisationId: user.organisationId, applianceIds: bundle!.visits.flatMap((v) => v.appliances.map((a) => a.id)) });
  return new Response(JSON.stringify(withTrends(bundle!, inspections)), { headers: { 'content-type': 'application/json', 'cache-control': 'no-store' } });
});
