'use client';
import Link from 'next/link';
import useSWR from 'swr';
import { fetchJson } from '@/lib/fetch-json';
import type { PortalSite } from '@/db/certificates';
import { Alert } from '@/components/ui/alert';
import { CertificateStatusBadge } from '@/components/certificates/certificate-status-badge';
import { VerdictBadge } from '@/components/ui/verdict-badge';
import { SafetyCaution } from '@/components/safety/caution';

function formatDate(iso: string): string {
  return new Date(`${iso}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}

export function PortalSites() {
  const { data, error, isLoading } = useSWR('/api/v1/portal/sites', (url: string) => fetchJson<{ items: PortalSite[] }>(url));
  if (error) return <Alert tone="error">{(error as Error).message}</Alert>;
  if (isLoading || !data) return <p className="text-ink-soft">Loading…</p>;
  if (data.items.length === 0) return <p className="text-ink-soft">No properties are registered to your account yet.</p>;
  return (
    <>
    <ul className="flex flex-col gap-2" aria-label="Properties">
      {data.items.map((s) => (
        <li key={s.id} data-testid="portal-site">
          <Link href={`/portal/sites/${s.id}`} className="block rounded-xl border border-line bg-card p-3 shadow-sm hover:border-copper">
            <span className="flex flex-wrap items-start gap-2">
              <span className="min-w-0 flex-1">
                <span className="block font-bold">{s.address}</span>
                <span className="block text-sm text-ink-soft">{s.town} {s.postcode}</span>
              </span>
              {s.current ? <CertificateStatusBadge status={s.current.status} /> : <span className="rounded-md border border-dashed border-ink-soft px-2 py-0.5 text-sm font-bold text-ink-soft">No certificate</span>}
            </span>
            <span className="mt-1 block text-sm">
              {s.current ? `${s.current.status === 'expired' ? 'Expired' : 'Valid until'} ${formatDate(s.current.expiresOn)} · ${s.current.numberText}` : 'No certificate on record yet.'}
            </span>
            {s.openFindings.length > 0 ? (
              <span className="mt-2 flex flex-wrap items-center gap-2 text-sm font-semibold">
                {/* Shape and word as well as colour: a danger must read as one without colour vision. */}
                <VerdictBadge level={s.openFindings.some((f) => f.severity === 'danger') ? 'danger' : 'service'} size="sm" />
                <span>
                  {s.openFindings.length} remedial item{s.openFindings.length === 1 ? '' : 's'} outstanding
                  {s.openFindings.some((f) => f.severity === 'danger') ? ': an appliance must not be used until it is repaired' : ''}
                </span>
              </span>
            ) : null}
            {s.renewalRequested ? <span className="mt-1 block text-sm text-ink-soft">Renewal requested</span> : null}
          </Link>
        </li>
      ))}
    </ul>
    <SafetyCaution compact />
    </>
  );
}
