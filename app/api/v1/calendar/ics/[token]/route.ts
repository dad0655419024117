// An engineer's calendar feed, for calendar apps that cannot sign in: the secret token in the URL
// is the credential (revocable by the office), so this handler has no session role check.
import { toErrorResponse } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { engineerForFeedToken, listFeedVisits } from '@/db/schedule';
import { buildCalendar } from '@/lib/calendar/ical';
import { env } from '@/lib/env';

export const runtime = 'nodejs';
export const dynamic = 'force-dynamic';

export async function GET(_req: Request, context: { params: Promise<{ token: string }> }): Promise<Response> {
  try {
    const { token } = await context.params;
    if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) throw new AppError('not_found', 'No such calendar.');
    const owner = await engineerForFeedToken(token);
    if (!owner) throw new AppError('not_found', 'No such calendar.');
    const visits = await listFeedVisits(owner.organisationId, owner.engineerId);
    const body = buildCalendar({ engineerName: owner.engineerName, timeZone: owner.timeZone, visits, domain: new URL(env().NEXTAUTH_URL).hostname });
    return new Response(body, { headers: { 'content-type': 'text/calendar; charset=utf-8', 'cache-control': 'private, no-store' } });
  } catch (err) {
    return toErrorResponse(err);
  }
}
