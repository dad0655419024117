import { NextResponse } from 'next/server';
import { apiRoute, parseJson } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { idSchema } from '@/lib/validations/list-query';
import { issueSchema } from '@/lib/validations/certificates';
import { actorFrom } from '@/db/audit';
import { deliverCertificate, issueCertificate } from '@/lib/certificates/issue';

export const runtime = 'nodejs';

// Issues the certificate for a submitted visit and, unless told not to, e-mails it to the landlord
// or homeowner and the tenant. The certificate stands even if an e-mail fails: the delivery log
// shows it and the office can resend.
export const POST = apiRoute<{ visitId: string }>(['office'], async ({ req, user, params }) => {
  const visitId = idSchema.safeParse(params.visitId);
  if (!visitId.success) throw new AppError('not_found', 'No such visit.');
  const { send } = await parseJson(req, issueSchema);
  const issued = await issueCertificate({ actor: actorFrom(user), visitId: visitId.data, appUrl: env().NEXTAUTH_URL });
  let deliveries: Array<{ kind: string; email: string; status: string }> = [];
  if (send) {
    try {
      deliveries = await deliverCertificate({ organisationId: user.organisationId, certificateId: issued.certificateId, sentBy: user.id, appUrl: env().NEXTAUTH_URL });
    } catch (err) {
      if (!(err instanceof AppError)) throw err;
      deliveries = [];
    }
  }
  return NextResponse.json({ certificate: issued, deliveries }, { status: 201 });
});
