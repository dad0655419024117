import { apiRoute, parseQuery } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { siteAudience } from '@/lib/auth/audience';
import { idSchema } from '@/lib/validations/list-query';
import { pdfQuerySchema } from '@/lib/validations/certificates';
import { certificatePdfFor } from '@/lib/certificates/issue';

export const runtime = 'nodejs';

// The certificate PDF: the stored bytes (digest-checked) for a current certificate; a void one
// comes marked VOID on every page (?original=1 gives the office the untouched original).
// Anyone outside the organisation, or a customer whose site it is not, gets a 404.
export const GET = apiRoute<{ id: string }>(['office', 'landlord', 'homeowner'], async ({ req, user, params }) => {
  const query = parseQuery(req, pdfQuerySchema);
  const id = idSchema.safeParse(params.id);
  const pdf = id.success ? await certificatePdfFor({ audience: siteAudience(user), certificateId: id.data, original: Boolean(query.original) && user.role === 'office' }) : null;
  if (!pdf) throw new AppError('not_found', 'No such certificate.');
  return new Response(new Uint8Array(pdf.bytes), {
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': `${query.download ? 'attachment' : 'inline'}; filename="${pdf.filename}"`,
      'cache-control': 'private, no-store',
    },
  });
});
