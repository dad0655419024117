import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { idSchema } from '@/lib/validations/list-query';
import { isVisitAssignedTo } from '@/db/certificates';
import { warningNoticeFor } from '@/lib/certificates/issue';

export const runtime = 'nodejs';

// The occupant warning notice for a danger finding: for the engineer assigned to the visit (to
// print or show on site, before any certificate exists) and for the office. Once a certificate is
// issued, the copy stored with it is served.
export const GET = apiRoute<{ id: string; findingId: string }>(['engineer', 'office'], async ({ user, params }) => {
  const visitId = idSchema.safeParse(params.id);
  const findingId = idSchema.safeParse(params.findingId);
  if (!visitId.success || !findingId.success) throw new AppError('not_found', 'No such warning notice.');
  if (user.role === 'engineer' && !(await isVisitAssignedTo({ organisationId: user.organisationId, visitId: visitId.data, engineerId: user.id }))) {
    throw new AppError('not_found', 'No such warning notice.');
  }
  const pdf = await warningNoticeFor({ organisationId: user.organisationId, visitId: visitId.data, findingId: findingId.data }).catch((err) => {
    if (err instanceof AppError && err.code === 'not_found') return null;
    throw err;
  });
  if (!pdf) throw new AppError('not_found', 'No such warning notice.');
  return new Response(new Uint8Array(pdf), {
    headers: { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="warning-notice-${findingId.data.slice(0, 8)}.pdf"`, 'cache-control': 'private, no-store' },
  });
});
