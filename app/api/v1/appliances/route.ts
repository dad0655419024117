import { NextResponse } from 'next/server';
import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { applianceListQuerySchema, applianceSchema } from '@/lib/validations/appliances';
import { createAppliance, listAppliances } from '@/db/appliances';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => listAppliances(user.organisationId, parseQuery(req, applianceListQuerySchema)));

export const POST = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, applianceSchema);
  return NextResponse.json({ appliance: await createAppliance(actorFrom(user), data) }, { status: 201 });
});
