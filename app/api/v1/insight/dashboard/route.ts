// GET /api/v1/insight/dashboard — the office's figures for the whole book: renewals, open danger
// findings, verdict rates by category and engineer, no-access rate, revenue and unpaid invoices.
import { apiRoute } from '@/lib/api/handler';
import { getDashboard } from '@/db/dashboard';
import { getOrganisationToday } from '@/db/code-profiles';

export const GET = apiRoute(['office'], async ({ user }) => {
  const today = await getOrganisationToday(user.organisationId);
  return getDashboard({ organisationId: user.organisationId, today });
});
