import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getCertificate } from '@/db/certificates';
import { listCertificateDeliveries } from '@/db/certificate-deliveries';
import { idSchema } from '@/lib/validations/list-query';
import { CertificateStatusBadge } from '@/components/certificates/certificate-status-badge';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SafetyCaution } from '@/components/safety/caution';
import { Alert } from '@/components/ui/alert';
import { CertificateActions } from './_components/certificate-actions';

export const metadata: Metadata = { title: 'Certificate' };

function longDate(iso: string): string {
  return new Date(`${iso.slice(0, 10)}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

function sentence(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

export default async function CertificatePage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ issued?: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const { issued } = await searchParams;
  const c = idSchema.safeParse(id).success ? await getCertificate({ organisationId: user.organisationId }, id) : null;
  if (!c) notFound();
  const deliveries = await listCertificateDeliveries({ organisationId: user.organisationId, certificateId: c.id });
  const content = c.content;
  const roomCoHigh = content.roomChecks.some((r) => r.level === 'service' || r.level === 'danger');
  return (
    <div className="flex flex-col gap-4" data-testid="certificate-page">
      {issued ? <Alert tone="success" title={`Certificate ${c.numberText} issued`}>{deliveries.length ? `E-mailed to ${deliveries.filter((d) => d.status === 'sent').map((d) => d.email).join(', ') || 'nobody (every send failed; resend below)'}.` : 'No e-mail address on the site to send to.'}</Alert> : null}
      <div className="flex flex-wrap items-start gap-3">
        <div className="min-w-0 flex-1">
          <p className="text-sm text-ink-soft"><Link href="/office/certificates" className="underline">Certificates</Link></p>
          <h1 className="text-2xl font-bold" data-testid="certificate-number">{c.numberText}</h1>
          <p className="text-ink-soft">{c.address}, {c.town} {c.postcode} · {c.siteReference}</p>
        </div>
      </div>
      <dl className="flex flex-wrap items-center gap-x-4 gap-y-2" data-testid="certificate-standing">
        <div className="flex items-center gap-2"><dt className="text-sm text-ink-soft">Certificate</dt><dd><CertificateStatusBadge status={c.status} /></dd></div>
        <div className="flex items-center gap-2"><dt className="text-sm text-ink-soft">Outcome of the visit</dt><dd><VerdictBadge level={c.overallVerdict} /></dd></div>
      </dl>
      {c.voidedAt ? (
        <Alert tone="error" title="Void">
          Voided {longDate(c.voidedAt)} by {c.voidedByName ?? 'the office'}: {c.voidReason}
          {c.replacedById ? (
            <> Replaced by <Link className="font-semibold underline" href={`/office/certificates/${c.replacedById}`}>{c.replacedByNumberText}</Link>.</>
          ) : ' Not re-issued yet: the visit is back in the review queue.'}
        </Alert>
      ) : null}
      {c.replacesId ? <p>Corrects and replaces <Link className="font-semibold text-copper underline" href={`/office/certificates/${c.replacesId}`}>{c.replacesNumberText}</Link> (void).</p> : null}

      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-xl border border-line bg-card p-3">
        <dt className="text-ink-soft">Checked</dt><dd>{longDate(content.visit.date)} by {content.engineer.name}{content.engineer.registrationNumber ? ` (reg. ${content.engineer.registrationNumber})` : ''}</dd>
        <dt className="text-ink-soft">Issued</dt><dd>{longDate(c.issuedOn)} by {c.issuedByName ?? content.issuedBy}</dd>
        <dt className="text-ink-soft">Valid until</dt><dd>{longDate(c.expiresOn)}</dd>
        <dt className="text-ink-soft">PDF SHA-256</dt><dd className="break-all font-mono text-xs">{c.pdfSha256}</dd>
        <dt className="text-ink-soft">Check page</dt><dd className="break-all text-sm"><a className="text-copper underline" href={content.checkUrl}>{content.checkUrl}</a></dd>
      </dl>

      <CertificateActions id={c.id} voided={Boolean(c.voidedAt)} />

      <section aria-labelledby="appliances" className="rounded-xl border border-line bg-card p-3">
        <h2 id="appliances" className="text-xl font-bold">Appliances</h2>
        <ul className="mt-2 flex flex-col gap-2">
          {content.appliances.map((a) => (
            <li key={a.applianceId} className="flex flex-col gap-1">
              <span className="flex flex-wrap items-center gap-2"><VerdictBadge level={a.tested ? a.level : 'unknown'} size="sm" /><span className="font-semibold">{a.label}</span></span>
              <span className="text-sm text-ink-soft">{a.decidedBy ? sentence(a.decidedBy.explanation) : a.tested ? 'Every judged figure is within its limit.' : `Not tested${a.notTestedReason ? `: ${a.notTestedReason}` : ''}`}</span>
            </li>
          ))}
        </ul>
      </section>

      {c.notices.length > 0 ? (
        <section aria-labelledby="notices" className="rounded-xl border-2 border-danger bg-card p-3">
          <h2 id="notices" className="text-xl font-bold text-danger">Warning notices</h2>
          <ul className="mt-1 flex flex-col gap-1">
            {c.notices.map((n) => (
              <li key={n.findingId}><a className="font-semibold text-copper underline" href={`/api/v1/visits/${c.visitId}/warning-notices/${n.findingId}/pdf`}>Warning notice (PDF): {n.description}</a></li>
            ))}
          </ul>
        </section>
      ) : null}

      <section aria-labelledby="deliveries" className="rounded-xl border border-line bg-card p-3">
        <h2 id="deliveries" className="text-xl font-bold">E-mails</h2>
        {deliveries.length === 0 ? <p className="text-ink-soft">Not e-mailed yet.</p> : null}
        <ul className="mt-1 flex flex-col gap-1 text-sm" data-testid="deliveries">
          {deliveries.map((d) => (
            <li key={d.id}>
              <span className={d.status === 'sent' ? 'font-semibold text-clear' : 'font-semibold text-danger'}>{d.status === 'sent' ? 'Sent' : 'Failed'}</span> to {d.recipientKind} {d.email} · {new Date(d.at).toLocaleString('en-GB', { timeZone: 'Europe/London' })}
              {d.sentByName ? ` by ${d.sentByName}` : ''}{d.error ? ` (${d.error})` : ''}
            </li>
          ))}
        </ul>
        <p className="mt-2 text-sm"><Link className="text-copper underline" href={`/office/review/${c.visitId}`}>Open the visit record</Link></p>
      </section>
      <SafetyCaution compact={!roomCoHigh && c.overallVerdict !== 'danger'} showRoomCoAdvice={roomCoHigh || c.overallVerdict === 'danger'} />
    </div>
  );
}
