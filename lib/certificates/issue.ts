import 'server-only';
// Issuing, delivering and reading back certificates: the steps that join the database, the PDF
// renderer, object storage and mail. Route handlers and the demo seed call these.
import type { Actor } from '@/db/audit';
import { getCertificate, getCertificatePdfRef, getStoredNoticeRef, issueCertificateRecord, loadIssueSource, organisationToday, voidCertificate } from '@/db/certificates';
import { getCertificateRecipients, recordCertificateDelivery, type CertificateRecipient } from '@/db/certificate-deliveries';
import type { SiteAudience } from '@/db/sites';
import { AppError } from '@/lib/errors';
import { newId } from '@/lib/ids';
import { nextExpiry } from '@/lib/renewals';
import { storageFor } from '@/lib/storage';
import { sendCertificateMail } from '@/lib/mail/certificate-mail';
import { certificatePdfFilename, renderCertificatePdf } from '@/lib/pdf/certificate-document';
import { renderWarningNoticePdf, type WarningNoticeInput } from '@/lib/pdf/warning-notice-document';
import { checkUrl, hashCheckToken, newCheckToken, sha256Hex } from './check-token';
import { certificatePrefix, formatCertificateNumber } from './number';
import { applianceLabel, buildCertificateContent } from './snapshot';
import type { CertificateContent } from './types';
import { FINDING_ACTION_LABELS } from '@/lib/validations/inspection';
import { MADE_SAFE_BY_LABELS } from '@/lib/validations/inspection';

export type IssueResult = { certificateId: string; numberText: string };

function noticeFromContent(content: CertificateContent, findingId: string): WarningNoticeInput | null {
  const finding = content.findings.find((f) => f.id === findingId && f.severity === 'danger');
  if (!finding) return null;
  const madeSafe = content.makeSafe.find((m) => m.applianceLabel === finding.applianceLabel) ?? content.makeSafe[0] ?? null;
  return {
    organisation: { name: content.organisation.name, phone: content.organisation.phone, email: content.organisation.email },
    site: { addressLine1: content.site.addressLine1, addressLine2: content.site.addressLine2, town: content.site.town, postcode: content.site.postcode, reference: content.site.reference },
    engineer: content.engineer,
    visitDate: content.visit.date,
    finding: { id: finding.id, description: finding.description, applianceLabel: finding.applianceLabel, actionLabel: finding.actionLabel },
    madeSafe: madeSafe ? { madeSafeByLabel: madeSafe.madeSafeByLabel, consent: madeSafe.consent, refusalNote: madeSafe.refusalNote } : null,
    certificateNumberText: content.numberText,
  };
}

/**
 * Issues the certificate of a submitted visit: frozen content, limits snapshot, PDF stored with its
 * SHA-256, a warning notice per danger finding. A void certificate of the same visit is replaced
 * (linked) by this one. 409 when the visit is not waiting for a certificate.
 */
export async function issueCertificate(input: { actor: Actor; visitId: string; appUrl: string; /** Demo seeds back-date; the app always issues now. */ at?: Date }): Promise<IssueResult> {
  const { actor } = input;
  const source = await loadIssueSource(actor.organisationId, input.visitId);
  if (source.report.visit.status !== 'submitted') {
    throw new AppError('conflict', source.report.visit.status === 'certified' ? 'This visit already has a certificate. To correct it, void it and issue again.' : 'Only a submitted visit can be certified.');
  }
  const storage = storageFor(actor.organisationId);
  const issuedOn = await organisationToday(actor.organisationId, input.at);
  const checkedOn = source.report.visit.date;
  const expiresOn = nextExpiry({ checkedOn, previousExpiry: source.previousExpiry, policy: source.policy });
  let numberText = '';
  const id = await issueCertificateRecord({
    actor,
    visitId: input.visitId,
    replacesId: source.replaces?.id ?? null,
    build: async (number) => {
      const certificateId = newId();
      numberText = formatCertificateNumber(certificatePrefix(source.organisation.slug), number);
      const token = newCheckToken();
      const { content, limits } = buildCertificateContent({
        numberText,
        issuedOn,
        expiresOn,
        issuedAt: (input.at ?? new Date()).toISOString(),
        checkUrl: checkUrl(input.appUrl, token),
        replacesNumberText: source.replaces?.numberText ?? null,
        organisation: { name: source.organisation.name, address: source.organisation.address, phone: source.organisation.phone, email: source.organisation.email, registrationNumber: source.organisation.registrationNumber },
        engineer: source.engineer,
        issuedBy: actor.name ?? 'the office',
        site: source.site,
        visit: { id: input.visitId, date: checkedOn, kind: source.report.visit.kind },
        records: source.report.records,
        analysers: source.report.analysers,
        installation: source.installation,
        limits: source.limits,
      });
      const pdf = await renderCertificatePdf(content);
      const key = storage.keyFor('certificates', certificateId, certificatePdfFilename(numberText));
      await storage.put(key, new Uint8Array(pdf), 'application/pdf');
      const notices: Array<{ findingId: string; key: string; sha256: string }> = [];
      for (const finding of content.findings.filter((f) => f.severity === 'danger')) {
        const notice = noticeFromContent(content, finding.id);
        if (!notice) continue;
        const bytes = await renderWarningNoticePdf(notice);
        const noticeKey = storage.keyFor('certificates', certificateId, `warning-notice-${finding.id}.pdf`);
        await storage.put(noticeKey, new Uint8Array(bytes), 'application/pdf');
        notices.push({ findingId: finding.id, key: noticeKey, sha256: sha256Hex(bytes) });
      }
      return {
        id: certificateId,
        numberText,
        issuedOn,
        expiresOn,
        issuedAt: content.issuedAt,
        overall: content.overall,
        content,
        limits,
        pdf: { key, sha256: sha256Hex(pdf), bytes: pdf.length },
        checkTokenHash: hashCheckToken(token),
        notices,
      };
    },
  });
  return { certificateId: id, numberText };
}

/** Voids with a reason and, when asked, issues the correction from the visit's records at once. */
export async function voidAndMaybeReissue(input: { actor: Actor; certificateId: string; reason: string; reissue: boolean; appUrl: string }): Promise<{ voidedId: string; reissued: IssueResult | null }> {
  await voidCertificate({ actor: input.actor, id: input.certificateId, reason: input.reason });
  if (!input.reissue) return { voidedId: input.certificateId, reissued: null };
  const voided = await getCertificate({ organisationId: input.actor.organisationId }, input.certificateId);
  const reissued = await issueCertificate({ actor: input.actor, visitId: voided!.visitId, appUrl: input.appUrl });
  return { voidedId: input.certificateId, reissued };
}

/** The stored PDF, checked against its recorded SHA-256 so a changed file is never served. */
export async function readStoredPdf(organisationId: string, ref: { key: string; sha256: string }): Promise<Buffer> {
  const found = await storageFor(organisationId).get(ref.key);
  if (!found) throw new AppError('internal', 'The stored PDF is missing.');
  const bytes = Buffer.from(found.bytes);
  if (sha256Hex(bytes) !== ref.sha256) throw new AppError('internal', 'The stored PDF does not match its recorded digest.');
  return bytes;
}

/**
 * The PDF to hand out: the stored original for a current certificate; for a void one, the same
 * frozen content with a VOID band (or the untouched original when `original` is asked for).
 */
export async function certificatePdfFor(input: { audience: SiteAudience; certificateId: string; original?: boolean }): Promise<{ bytes: Buffer; filename: string } | null> {
  const ref = await getCertificatePdfRef(input.audience, input.certificateId);
  if (!ref) return null;
  if (!ref.voided || input.original) return { bytes: await readStoredPdf(input.audience.organisationId, ref), filename: certificatePdfFilename(ref.numberText) };
  const detail = await getCertificate(input.audience, input.certificateId);
  const bytes = await renderCertificatePdf(detail!.content, { voidedAt: detail!.voidedAt!, reason: detail!.voidReason ?? '', replacedByNumberText: detail!.replacedByNumberText });
  return { bytes, filename: certificatePdfFilename(ref.numberText, true) };
}

/** E-mails the certificate (and its warning notices) to each recipient and records every attempt. */
export async function deliverCertificate(input: { organisationId: string; certificateId: string; sentBy: string | null; appUrl: string; only?: CertificateRecipient['kind'][] }): Promise<Array<{ kind: string; email: string; status: 'sent' | 'failed' }>> {
  const detail = await getCertificate({ organisationId: input.organisationId }, input.certificateId);
  if (!detail) throw new AppError('not_found', 'No such certificate.');
  if (detail.voidedAt) throw new AppError('conflict', 'A void certificate is not sent out; send its replacement.');
  const recipients = (await getCertificateRecipients({ organisationId: input.organisationId, certificateId: input.certificateId })).filter((r) => !input.only || input.only.includes(r.kind));
  if (recipients.length === 0) throw new AppError('conflict', 'This site has no landlord, homeowner or tenant e-mail address to send to.');
  const ref = (await getCertificatePdfRef({ organisationId: input.organisationId }, input.certificateId))!;
  const pdf = await readStoredPdf(input.organisationId, ref);
  const notices: Array<{ filename: string; pdf: Buffer }> = [];
  for (const n of detail.notices) {
    const stored = await getStoredNoticeRef({ organisationId: input.organisationId, visitId: detail.visitId, findingId: n.findingId });
    if (stored) notices.push({ filename: `warning-notice-${detail.numberText}-${n.findingId.slice(0, 8)}.pdf`, pdf: await readStoredPdf(input.organisationId, stored) });
  }
  const results: Array<{ kind: string; email: string; status: 'sent' | 'failed' }> = [];
  for (const recipient of recipients) {
    try {
      const sent = await sendCertificateMail({ to: recipient.email, name: recipient.name, kind: recipient.kind, content: detail.content, siteId: detail.siteId, appUrl: input.appUrl, pdf, filename: certificatePdfFilename(detail.numberText), notices });
      await recordCertificateDelivery({ organisationId: input.organisationId, certificateId: input.certificateId, recipient, status: 'sent', messageId: sent.messageId, error: null, sentBy: input.sentBy });
      results.push({ kind: recipient.kind, email: recipient.email, status: 'sent' });
    } catch (err) {
      console.error('[certificates] could not e-mail certificate', input.certificateId, recipient.kind, err);
      await recordCertificateDelivery({ organisationId: input.organisationId, certificateId: input.certificateId, recipient, status: 'failed', messageId: null, error: err instanceof Error ? err.message.slice(0, 500) : 'unknown error', sentBy: input.sentBy });
      results.push({ kind: recipient.kind, email: recipient.email, status: 'failed' });
    }
  }
  return results;
}

/**
 * A warning notice for a danger finding of a visit. Once a certificate holds it, the stored copy;
 * before that (the engineer still on site), rendered from the visit's current records.
 */
export async function warningNoticeFor(input: { organisationId: string; visitId: string; findingId: string }): Promise<Buffer | null> {
  const stored = await getStoredNoticeRef(input);
  if (stored) return readStoredPdf(input.organisationId, stored);
  const source = await loadIssueSource(input.organisationId, input.visitId);
  const finding = source.report.records.findings.find((f) => f.id === input.findingId && f.severity === 'danger');
  if (!finding) return null;
  const inspection = source.report.records.inspections.find((i) => i.applianceId === finding.applianceId);
  const made = source.report.records.makeSafe.find((m) => m.applianceId === finding.applianceId) ?? null;
  return renderWarningNoticePdf({
    organisation: { name: source.organisation.name, phone: source.organisation.phone, email: source.organisation.email },
    site: source.site,
    engineer: source.engineer,
    visitDate: source.report.visit.date,
    finding: { id: finding.id, description: finding.description, applianceLabel: inspection ? applianceLabel(inspection.details) : null, actionLabel: FINDING_ACTION_LABELS[finding.action] ?? finding.action },
    madeSafe: made ? { madeSafeByLabel: MADE_SAFE_BY_LABELS[made.madeSafeBy], consent: made.consent, refusalNote: made.refusalNote } : null,
    certificateNumberText: null,
  });
}
