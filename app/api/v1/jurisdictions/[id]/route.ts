import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { jurisdictionPatchSchema } from '@/lib/validations/limits';
import { getJurisdiction, updateJurisdiction } from '@/db/jurisdictions';
import { getProfileForJurisdiction } from '@/db/code-profiles';

export const runtime = 'nodejs';

type P = { id: string };

// Another organisation's id answers 404 like a missing one.
export const GET = apiRoute<P>(['office'], async ({ user, params }) => {
  const jurisdiction = await getJurisdiction({ organisationId: user.organisationId, id: params.id });
  if (!jurisdiction) throw new AppError('not_found', 'No such jurisdiction.');
  const profile = await getProfileForJurisdiction({ organisationId: user.organisationId, jurisdictionId: params.id });
  return { jurisdiction, profile };
});

export const PATCH = apiRoute<P>(['office'], async ({ req, user, params }) => {
  const data = await parseJson(req, jurisdictionPatchSchema);
  const jurisdiction = await updateJurisdiction({ organisationId: user.organisationId, id: params.id, data });
  if (!jurisdiction) throw new AppError('not_found', 'No such jurisdiction.');
  return { jurisdiction };
});
