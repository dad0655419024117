import { apiRoute, parseJson, parseQuery } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { ruleChangeSchema, ruleRemoveQuerySchema } from '@/lib/validations/limits';
import { reviseProfile, type CodeProfile } from '@/db/code-profiles';
import { effectiveDate, requireProfile, toRuleInput } from '../../../../_lib/profile-owner';

export const runtime = 'nodejs';

type P = { id: string; ruleKey: string };

// A rule is addressed by its key, which it keeps from version to version; it must be in the latest version.
function requireRuleKey(profile: CodeProfile, ruleKey: string) {
  const latest = profile.versions.at(-1);
  if (!latest || !latest.rules.some((r) => r.ruleKey === ruleKey)) throw new AppError('not_found', 'No such rule in the latest version of this profile.');
}

/**
 * Edits one rule (the body is the whole rule, as the form sends it). The change is a new version
 * with its effective date (today by default); the version that held the old figure is untouched
 * and still decides any date before the new one.
 */
export const PATCH = apiRoute<P>(['office'], async ({ req, user, params }) => {
  const current = await requireProfile(user, params.id);
  requireRuleKey(current, params.ruleKey);
  const body = await parseJson(req, ruleChangeSchema);
  const { effectiveFrom } = await effectiveDate(user, body.effectiveFrom);
  const profile = await reviseProfile({
    organisationId: user.organisationId,
    profileId: current.id,
    effectiveFrom,
    summary: body.summary ?? 'Rule changed',
    createdBy: user.id,
    revise: (latest) => latest.map((rule) => (rule.ruleKey === params.ruleKey ? toRuleInput(body, rule.ruleKey) : rule)),
  });
  return { profile };
});

// Removing a rule is also a new version: from its date the metric falls back to the parent's rule.
export const DELETE = apiRoute<P>(['office'], async ({ req, user, params }) => {
  const current = await requireProfile(user, params.id);
  requireRuleKey(current, params.ruleKey);
  const query = parseQuery(req, ruleRemoveQuerySchema);
  const { effectiveFrom } = await effectiveDate(user, query.effectiveFrom);
  const profile = await reviseProfile({
    organisationId: user.organisationId,
    profileId: current.id,
    effectiveFrom,
    summary: query.summary ?? 'Rule removed',
    createdBy: user.id,
    revise: (latest) => latest.filter((rule) => rule.ruleKey !== params.ruleKey),
  });
  return { profile };
});
