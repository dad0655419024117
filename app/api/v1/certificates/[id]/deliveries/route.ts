import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { idSchema } from '@/lib/validations/list-query';
import { resendSchema } from '@/lib/validations/certificates';
import { listCertificateDeliveries } from '@/db/certificate-deliveries';
import { getCertificate } from '@/db/certificates';
import { deliverCertificate } from '@/lib/certificates/issue';

export const runtime = 'nodejs';

async function certificateId(organisationId: string, raw: string): Promise<string> {
  const id = idSchema.safeParse(raw);
  const found = id.success ? await getCertificate({ organisationId }, id.data) : null;
  if (!found) throw new AppError('not_found', 'No such certificate.');
  return found.id;
}

// Every e-mail of the certificate, newest first.
export const GET = apiRoute<{ id: string }>(['office'], async ({ user, params }) => ({
  items: await listCertificateDeliveries({ organisationId: user.organisationId, certificateId: await certificateId(user.organisationId, params.id) }),
}));

// Resend to everyone on the site (or the chosen recipients); each attempt is recorded.
export const POST = apiRoute<{ id: string }>(['office'], async ({ req, user, params }) => {
  const id = await certificateId(user.organisationId, params.id);
  const { recipients } = await parseJson(req, resendSchema);
  return { results: await deliverCertificate({ organisationId: user.organisationId, certificateId: id, sentBy: user.id, appUrl: env().NEXTAUTH_URL, only: recipients }) };
});
