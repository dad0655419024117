import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { calendarFeedSchema } from '@/lib/validations/visits';
import { issueCalendarFeed, listCalendarFeeds } from '@/db/schedule';
import { actorFrom } from '@/db/audit';
import { env } from '@/lib/env';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ user }) => ({ feeds: await listCalendarFeeds(user.organisationId) }));

// The secret URL is shown this once; only its hash is kept.
export const POST = apiRoute(['office'], async ({ req, user }) => {
  const { engineerId } = await parseJson(req, calendarFeedSchema);
  const feed = await issueCalendarFeed(actorFrom(user), engineerId);
  return NextResponse.json({ id: feed.id, url: `${env().NEXTAUTH_URL}/api/v1/calendar/ics/${feed.token}` }, { status: 201 });
});
