import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getSiteDetail, listJurisdictionOptions, listNoAccessAttempts } from '@/db/sites';
import { listCustomerOptions } from '@/db/customers';
import { listAppliances } from '@/db/appliances';
import { getOrganisationTimeZone, listSiteVisits } from '@/db/schedule';
import { getSiteRenewal } from '@/db/reminders';
import { utcToZoned } from '@/lib/schedule/zoned';
import { VISIT_STATUS_LABELS } from '@/lib/schedule/lifecycle';
import { VISIT_KIND_LABELS, type VisitKind } from '@/lib/validations/visits';
import { APPLIANCE_CATEGORY_LABELS, type ApplianceCategory } from '@/lib/limits/types';
import { ButtonLink } from '@/components/ui/button';
import { SiteForm } from '../_components/site-form';
import { RenewalBadge } from '../../renewals/_components/renewal-badge';

export const metadata: Metadata = { title: 'Site' };
export const dynamic = 'force-dynamic';

export default async function SitePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const site = await getSiteDetail(user.organisationId, id);
  if (!site) notFound();
  const org = user.organisationId;
  const [appliances, visits, attempts, jurisdictions, customers, timeZone, renewal] = await Promise.all([
    listAppliances(org, { siteId: id, page: 1, pageSize: 100, sort: 'location', dir: 'asc' }),
    listSiteVisits(org, id),
    listNoAccessAttempts(org, id),
    listJurisdictionOptions(org),
    listCustomerOptions(org),
    getOrganisationTimeZone(org),
    getSiteRenewal(org, id),
  ]);
  const when = (iso: string) => {
    const z = utcToZoned(iso, timeZone);
    return `${z.date} ${z.time}`;
  };
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="mr-auto text-2xl font-bold">{site.reference} · {site.addressLine1}</h1>
        <ButtonLink href={`/office/board/new?siteId=${site.id}`}>Book a visit</ButtonLink>
      </div>
      {renewal ? (
        <section aria-labelledby="renewal-title" className="rounded-xl border border-line bg-card p-3 text-sm">
          <h2 id="renewal-title" className="text-lg font-bold">Certificate</h2>
          <p className="flex flex-wrap items-center gap-2">
            <RenewalBadge state={renewal.state} daysLeft={renewal.daysLeft} />
            {renewal.expiresOn ? <span>expires {renewal.expiresOn}; last check {renewal.lastCheckedOn}</span> : <span>No certified check on record.</span>}
          </p>
          <p className="text-ink-soft">Rule: {renewal.policy.periodMonths} months, early-renewal window {renewal.policy.earlyRenewalDays} days — {renewal.policySource}.</p>
        </section>
      ) : null}

      <section aria-labelledby="appliances-title" className="flex flex-col gap-2">
        <div className="flex items-center gap-2">
          <h2 id="appliances-title" className="mr-auto text-lg font-bold">Appliances ({appliances.total})</h2>
          <ButtonLink href={`/office/sites/${site.id}/appliances/new`} variant="secondary">Add appliance</ButtonLink>
        </div>
        <ul className="grid gap-2 sm:grid-cols-2">
          {appliances.items.map((a) => (
            <li key={a.id} className="rounded-xl border border-line bg-card p-3 text-sm" data-testid="site-appliance">
              <Link href={`/office/sites/${site.id}/appliances/${a.id}`} className="font-semibold text-copper underline underline-offset-2">
                {APPLIANCE_CATEGORY_LABELS[a.category as ApplianceCategory] ?? a.category} — {a.location}
              </Link>
              <p className="text-ink-soft">{[a.make, a.model].filter(Boolean).join(' ') || 'Make not recorded'} · {a.fuel} · {a.flueType.replace(/_/g, ' ')}{a.serial ? ` · S/N ${a.serial}` : ''}</p>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="noaccess-title" className="flex flex-col gap-2">
        <h2 id="noaccess-title" className="text-lg font-bold">No-access attempts ({attempts.length})</h2>
        {attempts.length === 0 ? <p className="text-sm text-ink-soft">None recorded.</p> : (
          <ul className="flex flex-col gap-1 text-sm" data-testid="no-access-list">
            {attempts.map((a) => (
              <li key={a.visitId} className="rounded-lg border border-line bg-card p-2"><strong className="tabular">{when(a.at)}</strong> — {a.engineerName ?? 'office'}: {a.note ?? 'no note'}</li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="visits-title" className="flex flex-col gap-2">
        <h2 id="visits-title" className="text-lg font-bold">Visits</h2>
        <ul className="flex flex-col gap-1 text-sm">
          {visits.map((v) => (
            <li key={v.id} className="flex flex-wrap gap-2 rounded-lg border border-line bg-card p-2">
              <Link className="font-semibold text-copper underline" href={`/office/board/visits/${v.id}`}>{when(v.windowStart)}</Link>
              <span>{VISIT_KIND_LABELS[v.kind as VisitKind] ?? v.kind}</span>
              <span className="font-semibold">{VISIT_STATUS_LABELS[v.status]}</span>
              <span className="text-ink-soft">{v.engineerName ?? 'Unassigned'}</span>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="details-title" className="flex flex-col gap-2">
        <h2 id="details-title" className="text-lg font-bold">Site details</h2>
        <SiteForm
          id={site.id}
          jurisdictions={jurisdictions}
          landlords={customers.filter((c) => c.role === 'landlord')}
          homeowners={customers.filter((c) => c.role === 'homeowner')}
          initial={{
            reference: site.reference, addressLine1: site.addressLine1, addressLine2: site.addressLine2 ?? '', town: site.town, postcode: site.postcode, jurisdictionId: site.jurisdictionId,
            landlordId: site.landlordId ?? '', homeownerId: site.homeownerId ?? '', tenantName: site.tenantName ?? '', tenantEmail: site.tenantEmail ?? '', tenantPhone: site.tenantPhone ?? '', accessNotes: site.accessNotes ?? '',
          }}
        />
      </section>
    </div>
  );
}
