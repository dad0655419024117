import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { applyPreset, getPreset } from '@/lib/limits';
import { profileCreateSchema, profilePatchSchema } from '@/lib/validations/limits';
import { createProfile, getOrgDefaultProfile, getProfileForJurisdiction, renameProfile, reviseProfile } from '@/db/code-profiles';
import { effectiveDate, ownerFromParam, requireProfile, toRuleInput } from '../../_lib/profile-owner';

export const runtime = 'nodejs';

type P = { id: string };

// [id] is a jurisdiction id, or "default" for the organisation's default profile.
export const GET = apiRoute<P>(['office'], async ({ user, params }) => ({ profile: await requireProfile(user, params.id) }));

/**
 * Creates the profile (201), empty or copied from a preset with optional overrides. When the
 * profile exists, a preset is loaded into it as a new version (200); without a preset that is 409.
 */
export const POST = apiRoute<P>(['office'], async ({ req, user, params }) => {
  const owner = ownerFromParam(params.id);
  const body = await parseJson(req, profileCreateSchema);
  const { effectiveFrom } = await effectiveDate(user, body.effectiveFrom);
  const preset = body.presetId ? getPreset(body.presetId) : null;
  const overrides = (body.overrides ?? []).map((rule) => toRuleInput(rule));
  const rules = preset ? applyPreset(preset, { overrides }) : overrides;
  const existing =
    'jurisdictionId' in owner
      ? await getProfileForJurisdiction({ organisationId: user.organisationId, jurisdictionId: owner.jurisdictionId })
      : await getOrgDefaultProfile(user.organisationId);
  if (existing && preset) {
    const profile = await reviseProfile({
      organisationId: user.organisationId,
      profileId: existing.id,
      effectiveFrom,
      summary: body.summary ?? `Loaded from the ${preset.name} preset`,
      createdBy: user.id,
      name: body.name,
      presetId: preset.id,
      revise: () => rules,
    });
    return { profile };
  }
  const profile = await createProfile({
    organisationId: user.organisationId,
    owner,
    name: body.name,
    presetId: preset?.id ?? null,
    effectiveFrom,
    summary: body.summary ?? (preset ? `Loaded from the ${preset.name} preset` : 'New profile'),
    createdBy: user.id,
    rules,
  });
  return NextResponse.json({ profile }, { status: 201 });
});

// Renaming does not change any limit, so it needs no new version.
export const PATCH = apiRoute<P>(['office'], async ({ req, user, params }) => {
  const profile = await requireProfile(user, params.id);
  const body = await parseJson(req, profilePatchSchema);
  await renameProfile({ organisationId: user.organisationId, profileId: profile.id, name: body.name });
  return { profile: { ...profile, name: body.name } };
});
