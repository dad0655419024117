import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { listCertificates } from '@/db/certificates';
import { listRenewalRequests } from '@/db/renewal-requests';
import { CertificateStatusBadge } from '@/components/certificates/certificate-status-badge';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SafetyCaution } from '@/components/safety/caution';
import { CloseRequestButton } from '../_components/close-request-button';

export const metadata: Metadata = { title: 'Certificates' };

function shortDate(iso: string): string {
  return new Date(`${iso.slice(0, 10)}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}

export default async function CertificatesPage({ searchParams }: { searchParams: Promise<{ status?: string }> }) {
  const user = await requirePageRole(['office']);
  const { status } = await searchParams;
  const filter = status === 'valid' || status === 'expired' || status === 'void' ? status : undefined;
  const [{ items, total }, requests] = await Promise.all([
    listCertificates({ organisationId: user.organisationId }, { status: filter, pageSize: 100 }),
    listRenewalRequests({ organisationId: user.organisationId }, { status: 'open' }),
  ]);
  return (
    <div className="flex flex-col gap-4" data-testid="certificates-page">
      <h1 className="text-2xl font-bold">Certificates</h1>
      {requests.length > 0 ? (
        <section aria-labelledby="renewals" className="rounded-xl border border-copper bg-copper-soft p-3">
          <h2 id="renewals" className="font-bold">Renewal requests from customers ({requests.length})</h2>
          <ul className="mt-2 flex flex-col gap-2">
            {requests.map((r) => (
              <li key={r.id} className="flex flex-wrap items-center gap-2 text-sm" data-testid="renewal-request">
                <span className="min-w-0 flex-1">
                  <span className="font-semibold">{r.address}, {r.town}</span> ({r.siteReference}) · asked by {r.requestedByName ?? 'customer'} on {new Date(r.createdAt).toLocaleDateString('en-GB')}
                  {r.preferredTimes ? ` · prefers ${r.preferredTimes}` : ''}
                  {r.note ? ` · “${r.note}”` : ''}
                </span>
                <CloseRequestButton id={r.id} />
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <nav aria-label="Filter by status" className="flex flex-wrap gap-2 text-sm">
        {[['', 'All'], ['valid', 'Valid'], ['expired', 'Expired'], ['void', 'Void']].map(([value, label]) => (
          <Link key={value} href={value ? `/office/certificates?status=${value}` : '/office/certificates'} aria-current={(filter ?? '') === value ? 'page' : undefined} className="inline-flex min-h-11 items-center rounded-lg border border-line bg-white px-3 font-semibold aria-[current=page]:border-copper aria-[current=page]:text-copper">
            {label}
          </Link>
        ))}
      </nav>
      <p className="text-ink-soft">{total} certificate{total === 1 ? '' : 's'}</p>
      <ul className="flex flex-col gap-2">
        {items.map((c) => (
          <li key={c.id}>
            <Link href={`/office/certificates/${c.id}`} className="flex flex-wrap items-center gap-x-3 gap-y-1 rounded-xl border border-line bg-card p-3 shadow-sm hover:border-copper" data-testid="certificate-item">
              <span className="min-w-0 basis-full sm:basis-0 sm:flex-1">
                <span className="block font-bold">{c.numberText}</span>
                <span className="block text-sm text-ink-soft">{c.address}, {c.town}</span>
                <span className="block text-sm text-ink-soft">Issued {shortDate(c.issuedOn)} · valid until {shortDate(c.expiresOn)}</span>
              </span>
              <CertificateStatusBadge status={c.status} />
              <VerdictBadge level={c.overallVerdict} size="sm" />
            </Link>
          </li>
        ))}
      </ul>
      <SafetyCaution compact />
    </div>
  );
}
