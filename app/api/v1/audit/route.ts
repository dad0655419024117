import { apiRoute, parseQuery } from '@/lib/api/handler';
import { auditQuerySchema } from '@/lib/validations/users';
import { listAudit } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ req, user }) => listAudit(user.organisationId, parseQuery(req, auditQuerySchema)));
