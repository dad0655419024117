import 'server-only';
// Shared by the profile routes: which profile the [id] segment names ("default" is the
// organisation's default profile), and the effective date of a new version.
import { getOrgDefaultProfile, getOrganisationToday, getProfileForJurisdiction, type CodeProfile, type ProfileOwner, type RuleInput } from '@/db/code-profiles';
import { AppError } from '@/lib/errors';
import type { SessionUser } from '@/lib/auth/session';
import type { LimitRuleData } from '@/lib/validations/limits';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function ownerFromParam(id: string): ProfileOwner {
  if (id === 'default') return { orgDefault: true };
  if (!UUID.test(id)) throw new AppError('not_found', 'No such jurisdiction.');
  return { jurisdictionId: id };
}

/** The profile named by the segment; 404 when there is none in the user's organisation. */
export async function requireProfile(user: SessionUser, id: string): Promise<CodeProfile> {
  const owner = ownerFromParam(id);
  const profile =
    'jurisdictionId' in owner
      ? await getProfileForJurisdiction({ organisationId: user.organisationId, jurisdictionId: owner.jurisdictionId })
      : await getOrgDefaultProfile(user.organisationId);
  if (!profile) throw new AppError('not_found', 'This jurisdiction has no code profile yet.');
  return profile;
}

/**
 * A new version takes effect today (in the organisation's time zone) unless a later date is given.
 * An earlier date is refused: it would change the limits that applied to days already judged.
 */
export async function effectiveDate(user: SessionUser, requested: string | undefined): Promise<{ effectiveFrom: string; today: string }> {
  const today = await getOrganisationToday(user.organisationId);
  if (requested !== undefined && requested < today) {
    throw new AppError('invalid_input', 'A new version cannot take effect in the past.', {
      effectiveFrom: `Choose today (${today}) or later: an earlier date would change limits already applied`,
    });
  }
  return { effectiveFrom: requested ?? today, today };
}

export function toRuleInput(rule: LimitRuleData, ruleKey?: string): RuleInput {
  return {
    ...(ruleKey ? { ruleKey } : {}),
    metric: rule.metric,
    scope: { category: rule.scope.category, fuel: rule.scope.fuel, testPoint: rule.scope.testPoint },
    comparator: rule.comparator,
    serviceAt: rule.serviceAt,
    dangerAt: rule.dangerAt,
    source: rule.source,
    note: rule.note,
  };
}
