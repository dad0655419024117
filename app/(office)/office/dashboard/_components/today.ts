import 'server-only';
import { getOrganisationToday } from '@/db/code-profiles';

/** The organisation's calendar date: dashboard figures count days in its time zone. */
export function organisationToday(organisationId: string): Promise<string> {
  return getOrganisationToday(organisationId);
}
