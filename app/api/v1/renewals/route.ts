import { apiRoute, parseQuery } from '@/lib/api/handler';
import { renewalListQuerySchema } from '@/lib/validations/renewals';
import { listRenewals } from '@/db/reminders';

export const runtime = 'nodejs';
export const dynamic = 'force-dynamic';

export const GET = apiRoute(['office'], async ({ req, user }) => listRenewals(user.organisationId, parseQuery(req, renewalListQuerySchema)));
