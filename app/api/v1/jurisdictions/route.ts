import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { jurisdictionSchema } from '@/lib/validations/limits';
import { createJurisdiction, listJurisdictions } from '@/db/jurisdictions';

export const runtime = 'nodejs';

// The organisation's jurisdiction tree, parents before children, each with its profile summary.
export const GET = apiRoute(['office'], async ({ user }) => ({ jurisdictions: await listJurisdictions(user.organisationId) }));

export const POST = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, jurisdictionSchema);
  return NextResponse.json({ jurisdiction: await createJurisdiction({ organisationId: user.organisationId, data }) }, { status: 201 });
});
