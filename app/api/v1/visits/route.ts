import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { visitSchema } from '@/lib/validations/visits';
import { createVisit } from '@/db/schedule';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

// Booking answers 201 even with clashes: they are warnings the office may knowingly accept.
export const POST = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, visitSchema);
  return NextResponse.json(await createVisit(actorFrom(user), data), { status: 201 });
});
