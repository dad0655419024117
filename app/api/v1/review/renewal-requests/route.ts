import { apiRoute } from '@/lib/api/handler';
import { listRenewalRequests } from '@/db/renewal-requests';

export const runtime = 'nodejs';

// Open "book my renewal" requests from landlords and homeowners.
export const GET = apiRoute(['office'], async ({ user }) => ({ items: await listRenewalRequests({ organisationId: user.organisationId }, { status: 'open' }) }));
