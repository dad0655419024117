import { apiRoute } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { siteAudience } from '@/lib/auth/audience';
import { idSchema } from '@/lib/validations/list-query';
import { getCertificate } from '@/db/certificates';
import { listCertificateDeliveries } from '@/db/certificate-deliveries';
import type { SessionUser } from '@/lib/auth/session';

export const runtime = 'nodejs';

async function found(user: SessionUser, id: string) {
  const parsed = idSchema.safeParse(id);
  const certificate = parsed.success ? await getCertificate(siteAudience(user), parsed.data) : null;
  if (!certificate) throw new AppError('not_found', 'No such certificate.');
  return certificate;
}

// One certificate with its frozen content; the office also sees where it was e-mailed.
export const GET = apiRoute<{ id: string }>(['office', 'landlord', 'homeowner'], async ({ user, params }) => {
  const certificate = await found(user, params.id);
  const deliveries = user.role === 'office' ? await listCertificateDeliveries({ organisationId: user.organisationId, certificateId: certificate.id }) : [];
  return { certificate, deliveries };
});

// An issued certificate never changes. Every attempt to edit or delete one is refused; a correction
// is a void (POST …/void, reason required) and a new certificate under a new number.
const refuseChange = apiRoute<{ id: string }>(['office'], async ({ user, params }) => {
  const certificate = await found(user, params.id);
  throw new AppError('conflict', `Certificate ${certificate.numberText} is issued and cannot be changed or deleted. To correct it, void it with a reason and issue a new one.`);
});

export const PUT = refuseChange;
export const PATCH = refuseChange;
export const DELETE = refuseChange;
