import 'server-only';
// Every e-mail of a certificate: to whom (landlord, homeowner, tenant), when, sent or failed, and
// by whom. Rows are only ever added, so the office can show what was sent and resend.
import { db } from './knex';
import { toIso } from './rows';
import { newId } from '@/lib/ids';

type Row = Record<string, unknown>;

export type RecipientKind = 'landlord' | 'homeowner' | 'tenant';
export type CertificateRecipient = { kind: RecipientKind; email: string; name: string | null };

export type CertificateDelivery = {
  id: string;
  recipientKind: RecipientKind;
  email: string;
  status: 'sent' | 'failed';
  error: string | null;
  sentByName: string | null;
  at: string;
};

/** Who a certificate goes to, from the site as it is now (a new tenant gets the resend). */
export async function getCertificateRecipients(input: { organisationId: string; certificateId: string }): Promise<CertificateRecipient[]> {
  const row: Row | undefined = await db()('certificates as c')
    .join('sites as s', 's.id', 'c.site_id')
    .leftJoin('users as l', 'l.id', 's.landlord_id')
    .leftJoin('users as h', 'h.id', 's.homeowner_id')
    .where({ 'c.id': input.certificateId, 'c.organisation_id': input.organisationId })
    .first('l.email as landlord_email', 'l.name as landlord_name', 'l.active as landlord_active', 'h.email as homeowner_email', 'h.name as homeowner_name', 's.tenant_email', 's.tenant_name');
  if (!row) return [];
  const out: CertificateRecipient[] = [];
  if (row.landlord_email) out.push({ kind: 'landlord', email: String(row.landlord_email), name: (row.landlord_name as string | null) ?? null });
  if (row.homeowner_email) out.push({ kind: 'homeowner', email: String(row.homeowner_email), name: (row.homeowner_name as string | null) ?? null });
  if (row.tenant_email) out.push({ kind: 'tenant', email: String(row.tenant_email), name: (row.tenant_name as string | null) ?? null });
  return out;
}

export async function recordCertificateDelivery(input: {
  organisationId: string;
  certificateId: string;
  recipient: CertificateRecipient;
  status: 'sent' | 'failed';
  messageId: string | null;
  error: string | null;
  sentBy: string | null;
}): Promise<void> {
  await db()('certificate_deliveries').insert({
    id: newId(),
    organisation_id: input.organisationId,
    certificate_id: input.certificateId,
    recipient_kind: input.recipient.kind,
    email: input.recipient.email,
    status: input.status,
    message_id: input.messageId,
    error: input.error,
    sent_by: input.sentBy,
    at: new Date().toISOString(),
  });
}

export async function listCertificateDeliveries(input: { organisationId: string; certificateId: string }): Promise<CertificateDelivery[]> {
  const rows: Row[] = await db()('certificate_deliveries as d')
    .leftJoin('users as u', 'u.id', 'd.sent_by')
    .where({ 'd.certificate_id': input.certificateId, 'd.organisation_id': input.organisationId })
    .select('d.id', 'd.recipient_kind', 'd.email', 'd.status', 'd.error', 'd.at', 'u.name as sent_by_name')
    .orderBy('d.at', 'desc');
  return rows.map((r) => ({
    id: String(r.id),
    recipientKind: r.recipient_kind as RecipientKind,
    email: String(r.email),
    status: r.status as 'sent' | 'failed',
    error: (r.error as string | null) ?? null,
    sentByName: (r.sent_by_name as string | null) ?? null,
    at: toIso(r.at) ?? '',
  }));
}
