import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { siteAudience } from '@/lib/auth/audience';
import { idSchema } from '@/lib/validations/list-query';
import { listCertificates, listPortalSites } from '@/db/certificates';
import { listRenewalRequests } from '@/db/renewal-requests';
import { CertificateStatusBadge } from '@/components/certificates/certificate-status-badge';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SafetyCaution } from '@/components/safety/caution';
import { buttonClass } from '@/components/ui/button';
import { BookRenewal } from './_components/book-renewal';

export const metadata: Metadata = { title: 'Property' };

/** The outcome of the last check in plain words; a danger is never left as a badge alone. */
const OUTCOME_LINES = {
  clear: 'Every appliance tested was within its limits.',
  service: 'Service or repair is advised: see the remedial work below.',
  danger: 'Something was found dangerous and made safe. It must not be used until it has been repaired: see the remedial work below.',
  unknown: 'Some figures could not be judged against a limit; the certificate says which.',
} as const;

function formatDate(iso: string): string {
  return new Date(`${iso}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

export default async function PortalSitePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['landlord', 'homeowner']);
  const { id } = await params;
  const audience = siteAudience(user);
  const [site] = idSchema.safeParse(id).success ? await listPortalSites(audience, id) : [];
  if (!site) notFound();
  const [{ items: certificates }, requests] = await Promise.all([listCertificates(audience, { siteId: site.id }), listRenewalRequests(audience, { siteId: site.id, status: 'open' })]);
  const current = site.current;
  return (
    <div className="flex flex-col gap-4" data-testid="portal-site-page">
      <div>
        <p className="text-sm"><Link href="/portal" className="text-copper underline">{user.role === 'landlord' ? 'My properties' : 'My home'}</Link></p>
        <h1 className="text-2xl font-bold">{site.address}</h1>
        <p className="text-ink-soft">{site.town} {site.postcode}</p>
      </div>

      <section aria-labelledby="current" className="rounded-xl border border-line bg-card p-3">
        <h2 id="current" className="text-lg font-bold">Current certificate</h2>
        {current ? (
          <div className="mt-1 flex flex-col gap-2">
            <p className="flex flex-wrap items-center gap-2">
              <CertificateStatusBadge status={current.status} />
              <span className="font-semibold">{current.numberText}</span>
            </p>
            <p>{current.status === 'expired' ? 'Expired on' : 'Valid until'} <strong>{formatDate(current.expiresOn)}</strong> · issued {formatDate(current.issuedOn)}</p>
            <p className="flex flex-wrap items-center gap-2 text-sm">Outcome of the check: <VerdictBadge level={current.overallVerdict} size="sm" /></p>
            <p className={current.overallVerdict === 'danger' ? 'font-semibold text-danger' : 'text-sm'} data-testid="portal-outcome">{OUTCOME_LINES[current.overallVerdict]}</p>
            <a className={buttonClass('primary', 'self-start')} href={`/api/v1/certificates/${current.id}/pdf?download=1`} data-testid="download-current">Download certificate (PDF)</a>
          </div>
        ) : (
          <p className="text-ink-soft">No certificate on record yet.</p>
        )}
      </section>

      <BookRenewal siteId={site.id} alreadyRequested={requests.length > 0} />

      <section aria-labelledby="remedial" className="rounded-xl border border-line bg-card p-3">
        <h2 id="remedial" className="text-lg font-bold">Remedial work outstanding</h2>
        {site.openFindings.length === 0 ? <p className="text-ink-soft">Nothing outstanding on the current certificate.</p> : null}
        <ul className="mt-1 flex flex-col gap-2">
          {site.openFindings.map((f, i) => (
            <li key={i} className="flex flex-col gap-1">
              <span className="flex flex-wrap items-center gap-2"><VerdictBadge level={f.severity} size="sm" />{f.applianceLabel ? <span className="text-sm text-ink-soft">{f.applianceLabel}</span> : null}</span>
              <span>{f.description}</span>
              <span className="text-sm text-ink-soft">On the visit: {f.actionLabel}</span>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="history" className="rounded-xl border border-line bg-card p-3">
        <h2 id="history" className="text-lg font-bold">All certificates</h2>
        <ul className="mt-1 flex flex-col divide-y divide-line">
          {certificates.map((c) => (
            <li key={c.id} className="flex flex-wrap items-center gap-2 py-2" data-testid="portal-certificate">
              <span className="min-w-0 flex-1">
                <span className={`block font-semibold ${c.status === 'void' ? 'line-through' : ''}`}>{c.numberText}</span>
                <span className="block text-sm text-ink-soft">
                  Issued {formatDate(c.issuedOn)} · until {formatDate(c.expiresOn)}
                  {c.status === 'void' && c.replacedByNumberText ? ` · replaced by ${c.replacedByNumberText}` : ''}
                </span>
              </span>
              <CertificateStatusBadge status={c.status} />
              <a className="inline-flex min-h-11 items-center font-semibold text-copper underline" href={`/api/v1/certificates/${c.id}/pdf?download=1`} aria-label={`Download ${c.numberText}`}>PDF</a>
            </li>
          ))}
          {certificates.length === 0 ? <li className="py-2 text-ink-soft">None yet.</li> : null}
        </ul>
      </section>
      <SafetyCaution showRoomCoAdvice />
    </div>
  );
}
