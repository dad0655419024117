import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/session';
import { listJurisdictions } from '@/db/jurisdictions';
import { getOrganisationToday, listPreviewSites } from '@/db/code-profiles';
import { APPLIANCE_CATEGORY_LABELS, FUEL_LABELS } from '@/lib/limits';
import { VerdictPreview } from './_components/verdict-preview';

export const metadata: Metadata = { title: 'Preview a verdict' };

// The picker lists this many sites; enough for an office to try its limits on real appliances.
const PICKER_SITES = 200;

export default async function PreviewPage({ searchParams }: { searchParams: Promise<{ jurisdictionId?: string }> }) {
  const user = await requirePageRole(['office']);
  const { jurisdictionId } = await searchParams;
  const [jurisdictions, sites, today] = await Promise.all([
    listJurisdictions(user.organisationId),
    listPreviewSites({ organisationId: user.organisationId, limit: PICKER_SITES }),
    getOrganisationToday(user.organisationId),
  ]);
  const initial = jurisdictions.find((j) => j.id === jurisdictionId)?.id ?? null;
  return (
    <div className="flex flex-col gap-4">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href="/office/limits" className="underline">Limits</Link> <span aria-hidden="true">/</span> Preview
      </nav>
      <h1 className="text-2xl font-bold">Preview a verdict</h1>
      <p className="max-w-2xl text-ink-soft">Try the limits in force: the verdict names the rule that decided, the profile it came from and its source.</p>
      <VerdictPreview
        today={today}
        initialJurisdictionId={initial}
        jurisdictions={jurisdictions.map((j) => ({ id: j.id, name: j.name }))}
        sites={sites.map((s) => ({
          id: s.id,
          label: `${s.reference} — ${s.address} (${s.jurisdictionName})`,
          appliances: s.appliances.map((a) => ({ id: a.id, label: `${a.location}: ${APPLIANCE_CATEGORY_LABELS[a.category]}, ${FUEL_LABELS[a.fuel]}${a.make ? ` (${a.make})` : ''}` })),
        }))}
      />
    </div>
  );
}
