import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { versionPatchSchema } from '@/lib/validations/limits';
import { getOrganisationToday, updateVersion } from '@/db/code-profiles';
import { requireProfile } from '../../../../_lib/profile-owner';

export const runtime = 'nodejs';

type P = { id: string; version: string };

function versionNumber(raw: string): number {
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1) throw new AppError('not_found', 'No such profile version.');
  return n;
}

export const GET = apiRoute<P>(['office'], async ({ user, params }) => {
  const profile = await requireProfile(user, params.id);
  const version = profile.versions.find((v) => v.version === versionNumber(params.version));
  if (!version) throw new AppError('not_found', 'No such profile version.');
  return { version };
});

/**
 * Only a version not yet in force may be moved or reworded; its rules never change here.
 * A version already in force answers 409: it is history, and a change needs a new version.
 */
export const PATCH = apiRoute<P>(['office'], async ({ req, user, params }) => {
  const profile = await requireProfile(user, params.id);
  const body = await parseJson(req, versionPatchSchema);
  const today = await getOrganisationToday(user.organisationId);
  const version = await updateVersion({
    organisationId: user.organisationId,
    profileId: profile.id,
    version: versionNumber(params.version),
    today,
    ...(body.effectiveFrom !== undefined ? { effectiveFrom: body.effectiveFrom } : {}),
    ...(body.summary !== undefined ? { summary: body.summary } : {}),
  });
  return { version };
});
