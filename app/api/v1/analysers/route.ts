import { NextResponse } from 'next/server';
import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { analyserListQuerySchema, analyserSchema } from '@/lib/validations/analysers';
import { createAnalyser, listAnalysers } from '@/db/analysers';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

// Engineers read the register too: they choose their analyser for each visit.
export const GET = apiRoute(['office', 'engineer'], async ({ req, user }) => listAnalysers(user.organisationId, parseQuery(req, analyserListQuerySchema)));

export const POST = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, analyserSchema);
  return NextResponse.json({ analyser: await createAnalyser(actorFrom(user), data) }, { status: 201 });
});
