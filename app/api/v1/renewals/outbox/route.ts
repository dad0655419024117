import { apiRoute } from '@/lib/api/handler';
import { listOutbox } from '@/db/reminders';

export const runtime = 'nodejs';
export const dynamic = 'force-dynamic';

export const GET = apiRoute(['office'], async ({ user }) => ({ items: await listOutbox({ organisationId: user.organisationId, limit: 100 }) }));
