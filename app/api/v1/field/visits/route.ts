import { apiRoute } from '@/lib/api/handler';
import { getFieldBundle } from '@/db/inspections';

export const runtime = 'nodejs';

const DAYS_AHEAD = 14;

// The signed-in engineer's visits from the start of today (UTC) for two weeks, plus any still open
// from before, with everything needed to record them offline.
export const GET = apiRoute(['engineer'], async ({ user }) => {
  const start = new Date();
  start.setUTCHours(0, 0, 0, 0);
  const end = new Date(start.getTime() + DAYS_AHEAD * 86400_000);
  const bundle = await getFieldBundle({ organisationId: user.organisationId, engineerId: user.id, fromIso: start.toISOString(), toIso: end.toISOString() });
  return new Response(JSON.stringify(bundle), { headers: { 'content-type': 'application/json', 'cache-control': 'no-store' } });
});
