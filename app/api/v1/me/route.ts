import { apiRoute } from '@/lib/api/handler';
import { ROLES } from '@/lib/auth/roles';

export const runtime = 'nodejs';

export const GET = apiRoute(ROLES, async ({ user }) => ({ user }));
