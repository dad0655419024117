import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { loadIssueSource } from '@/db/certificates';
import { AppError } from '@/lib/errors';
import { buildCertificateContent } from '@/lib/certificates/snapshot';
import { idSchema } from '@/lib/validations/list-query';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SafetyCaution } from '@/components/safety/caution';
import { Alert } from '@/components/ui/alert';
import { ApplianceReview } from './_components/appliance-review';
import { ReviewActions } from './_components/review-actions';

export const metadata: Metadata = { title: 'Review visit' };

function formatDate(iso: string): string {
  return new Date(`${iso.slice(0, 10)}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

export default async function ReviewVisitPage({ params }: { params: Promise<{ visitId: string }> }) {
  const user = await requirePageRole(['office']);
  const { visitId } = await params;
  if (!idSchema.safeParse(visitId).success) notFound();
  const source = await loadIssueSource(user.organisationId, visitId).catch((err) => {
    if (err instanceof AppError && err.code === 'not_found') notFound();
    throw err;
  });
  const { report } = source;
  const bundle = report;
  // The same snapshot the certificate will freeze, so what is reviewed is what gets issued.
  const { content } = buildCertificateContent({
    numberText: '(on issue)',
    issuedOn: report.visit.date,
    expiresOn: report.visit.date,
    issuedAt: new Date().toISOString(),
    checkUrl: '',
    replacesNumberText: source.replaces?.numberText ?? null,
    organisation: { ...source.organisation },
    engineer: source.engineer,
    issuedBy: user.name,
    site: source.site,
    visit: { id: visitId, date: report.visit.date, kind: report.visit.kind },
    records: report.records,
    analysers: report.analysers,
    installation: source.installation,
    limits: source.limits,
  });
  const photos = report.photos;
  const dangerFindings = content.findings.filter((f) => f.severity === 'danger');
  const roomCoHigh = content.roomChecks.some((r) => r.level === 'service' || r.level === 'danger');
  return (
    <div className="flex flex-col gap-4" data-testid="review-visit">
      <div className="flex flex-wrap items-start gap-3">
        <div className="min-w-0 flex-1">
          <p className="text-sm text-ink-soft">
            <Link href="/office/review" className="underline">Review</Link> · {report.site.reference}
          </p>
          <h1 className="text-2xl font-bold">{report.site.address}, {report.site.town}</h1>
          <p className="text-ink-soft">
            Checked {formatDate(report.visit.date)} by {source.engineer.name}
            {source.engineer.registrationNumber ? ` (reg. ${source.engineer.registrationNumber})` : ''} · {report.site.jurisdictionName} · status {report.visit.status.replace('_', ' ')}
          </p>
        </div>
        <VerdictBadge level={content.overall} size="lg" />
      </div>

      {content.overall === 'danger' ? (
        <Alert tone="error" title="Danger found on this visit">
          {dangerFindings.length > 0 ? dangerFindings.map((f) => <p key={f.id}>{f.description}</p>) : <p>A reading is at the danger level; see the appliance below.</p>}
        </Alert>
      ) : null}
      {source.replaces ? <Alert tone="warning" title={`Replaces void certificate ${source.replaces.numberText}`}>Issuing gives the corrected certificate a new number, linked to the void one.</Alert> : null}

      <ReviewActions visitId={visitId} status={report.visit.status} />

      <SafetyCaution showRoomCoAdvice={roomCoHigh || content.overall === 'danger'} />

      <section aria-labelledby="appliances" className="flex flex-col gap-3">
        <h2 id="appliances" className="text-xl font-bold">Appliances</h2>
        {content.appliances.map((a) => (
          <ApplianceReview key={a.applianceId} appliance={a} photos={photos.filter((p) => p.applianceId === a.applianceId)} visitId={visitId} />
        ))}
        {content.appliances.length === 0 ? <p className="text-ink-soft">No appliance was recorded.</p> : null}
      </section>

      <section aria-labelledby="installation" className="rounded-xl border border-line bg-card p-3">
        <h2 id="installation" className="text-xl font-bold">Room CO and tightness</h2>
        <ul className="mt-2 flex flex-col gap-2">
          {content.roomChecks.map((r) => (
            <li key={r.room} className="flex flex-wrap items-center gap-2">
              <VerdictBadge level={r.level} size="sm" />
              <span className="font-semibold">{r.room}</span>
              <span>{r.coPpm} ppm{r.minutes !== null ? ` over ${r.minutes} min` : ''}</span>
              {r.explanation ? <span className="w-full text-sm text-ink-soft">{r.explanation}</span> : null}
            </li>
          ))}
          {content.roomChecks.length === 0 ? <li className="text-ink-soft">No room CO check recorded.</li> : null}
          {content.tightness ? (
            <li className="flex flex-wrap items-center gap-2">
              <VerdictBadge level={content.tightness.level} size="sm" />
              <span className="font-semibold">Tightness test</span>
              <span>
                {content.tightness.startMbar} → {content.tightness.endMbar} mbar over {content.tightness.durationMin} min (drop {content.tightness.dropMbar} mbar)
              </span>
              {content.tightness.explanation ? <span className="w-full text-sm text-ink-soft">{content.tightness.explanation}</span> : null}
            </li>
          ) : (
            <li className="text-ink-soft">No tightness test recorded.</li>
          )}
        </ul>
      </section>

      <section aria-labelledby="findings" className="rounded-xl border border-line bg-card p-3">
        <h2 id="findings" className="text-xl font-bold">Findings and actions</h2>
        <ul className="mt-2 flex flex-col gap-3">
          {content.findings.map((f) => (
            <li key={f.id} className="flex flex-col gap-1">
              <span className="flex flex-wrap items-center gap-2">
                <VerdictBadge level={f.severity === 'advice' ? 'clear' : f.severity} label={f.severityLabel} size="sm" />
                <span className="font-semibold">{f.actionLabel}</span>
                {f.applianceLabel ? <span className="text-sm text-ink-soft">{f.applianceLabel}</span> : null}
              </span>
              <span>{f.description}</span>
              {f.severity === 'danger' ? (
                <a className="text-sm font-semibold text-copper underline" href={`/api/v1/visits/${visitId}/warning-notices/${f.id}/pdf`}>
                  Warning notice (PDF)
                </a>
              ) : null}
              {photos.filter((p) => p.findingId === f.id).map((p) => (
                // eslint-disable-next-line @next/next/no-img-element -- streamed through the session-checked API, not static
                <img key={p.id} src={`/api/v1/review/${visitId}/photos/${p.id}`} alt={p.caption ?? 'Finding photo'} className="max-h-48 w-auto rounded-lg border border-line" />
              ))}
            </li>
          ))}
          {content.findings.length === 0 ? <li className="text-ink-soft">No defects or hazards recorded.</li> : null}
        </ul>
        {content.makeSafe.map((m, i) => (
          <p key={i} className="mt-2 text-sm">
            Made safe: {m.madeSafeByLabel}
            {m.applianceLabel ? ` (${m.applianceLabel})` : ''}; occupant {m.consent === 'given' ? 'agreed' : 'refused'}
            {m.occupantName ? ` (${m.occupantName})` : ''}
            {m.warningNoticeLeft ? '; warning notice left' : ''}.
          </p>
        ))}
      </section>

      <section aria-labelledby="signoff" className="rounded-xl border border-line bg-card p-3">
        <h2 id="signoff" className="text-xl font-bold">Sign-off</h2>
        {content.signoff ? (
          <div className="mt-1 flex flex-col gap-1">
            <p>{content.signoff.declarationText}</p>
            <p className="text-sm text-ink-soft">
              {content.signoff.signed ? `Signed by ${content.signoff.occupantName ?? 'the occupant'}.` : `No signature: ${(content.signoff.noSignatureReason ?? 'no reason given').replace(/\.+$/, '')}.`}
            </p>
            {bundle.signature?.photoId ? (
              // eslint-disable-next-line @next/next/no-img-element -- streamed through the session-checked API, not static
              <img src={`/api/v1/review/${visitId}/photos/${bundle.signature.photoId}`} alt={`Signature of ${content.signoff.occupantName ?? 'the occupant'}`} className="h-24 w-auto rounded border border-line bg-white" />
            ) : null}
          </div>
        ) : (
          <p className="text-ink-soft">No sign-off recorded.</p>
        )}
      </section>

      {bundle.returns.length > 0 ? (
        <section aria-labelledby="returns" className="rounded-xl border border-line bg-card p-3">
          <h2 id="returns" className="text-xl font-bold">Sent back before</h2>
          <ul className="mt-1 flex flex-col gap-1 text-sm">
            {bundle.returns.map((r) => (
              <li key={r.id}>
                {new Date(r.returnedAt).toLocaleDateString('en-GB')} by {r.returnedByName ?? 'the office'}: {r.comment}
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {bundle.certificates.length > 0 ? (
        <section aria-labelledby="issued" className="rounded-xl border border-line bg-card p-3">
          <h2 id="issued" className="text-xl font-bold">Certificates of this visit</h2>
          <ul className="mt-1 flex flex-col gap-1">
            {bundle.certificates.map((c) => (
              <li key={c.id}>
                <Link className="font-semibold text-copper underline" href={`/office/certificates/${c.id}`}>{c.numberText}</Link> · {c.status}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
