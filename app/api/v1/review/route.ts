import { apiRoute } from '@/lib/api/handler';
import { listReviewQueue } from '@/db/certificates';

export const runtime = 'nodejs';

// The office's queue: submitted visits waiting for review, oldest first.
export const GET = apiRoute(['office'], async ({ user }) => ({ items: await listReviewQueue(user.organisationId) }));
