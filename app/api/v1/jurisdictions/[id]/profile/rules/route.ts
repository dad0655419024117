import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { ruleChangeSchema } from '@/lib/validations/limits';
import { reviseProfile } from '@/db/code-profiles';
import { effectiveDate, requireProfile, toRuleInput } from '../../../_lib/profile-owner';

export const runtime = 'nodejs';

// Adding a rule writes a new version (the latest rules plus this one); earlier versions stay as they were.
export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  const current = await requireProfile(user, params.id);
  const body = await parseJson(req, ruleChangeSchema);
  const { effectiveFrom } = await effectiveDate(user, body.effectiveFrom);
  const profile = await reviseProfile({
    organisationId: user.organisationId,
    profileId: current.id,
    effectiveFrom,
    summary: body.summary ?? 'Rule added',
    createdBy: user.id,
    revise: (latest) => [...latest, toRuleInput(body)],
  });
  return NextResponse.json({ profile }, { status: 201 });
});
