import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { siteAudience } from '@/lib/auth/audience';
import { renewalRequestSchema } from '@/lib/validations/certificates';
import { createRenewalRequest } from '@/db/renewal-requests';

export const runtime = 'nodejs';

// "Book my renewal": puts a request in the office's queue (one open request per site; asking
// again answers with the open one).
export const POST = apiRoute(['landlord', 'homeowner'], async ({ req, user }) => {
  const input = await parseJson(req, renewalRequestSchema);
  const { request, created } = await createRenewalRequest({ audience: siteAudience(user), userId: user.id, siteId: input.siteId, note: input.note, preferredTimes: input.preferredTimes });
  return NextResponse.json({ request }, { status: created ? 201 : 200 });
});
