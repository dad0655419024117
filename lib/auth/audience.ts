// Turns a signed-in user into the slice of the organisation's data they may see.
import type { SessionUser } from './session';

export function siteAudience(user: Pick<SessionUser, 'organisationId' | 'role' | 'id'>) {
  if (user.role === 'landlord') return { organisationId: user.organisationId, landlordId: user.id };
  if (user.role === 'homeowner') return { organisationId: user.organisationId, homeownerId: user.id };
  return { organisationId: user.organisationId };
}
