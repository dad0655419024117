import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getApplianceHistorySource } from '@/db/insight';
import { buildApplianceHistory } from '@/lib/insight';
import { ApplianceTrend } from '@/components/insight/appliance-trend';
import { SafetyCaution } from '@/components/safety/caution';

export const metadata: Metadata = { title: 'Appliance history' };

const ID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export default async function ApplianceHistoryPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  if (!ID.test(id)) notFound();
  const source = await getApplianceHistorySource({ organisationId: user.organisationId, applianceId: id });
  if (!source) notFound();
  const { siteId, siteReference, siteAddress, ...appliance } = source.appliance;
  const history = buildApplianceHistory({ appliance, inspections: source.inspections, limitContext: source.limitContext });
  return (
    <div className="flex flex-col gap-4" data-testid="appliance-history-page">
      <header>
        <p className="text-sm text-ink-soft">
          <Link href={`/office/sites/${siteId}`} className="underline">{siteReference}</Link> · {siteAddress}
        </p>
        <h1 className="text-2xl font-bold">{appliance.label}</h1>
        <p className="text-sm text-ink-soft">{history.points.length} finished inspection{history.points.length === 1 ? '' : 's'}; limits shown are those in force on each date.</p>
      </header>
      <ApplianceTrend history={history} />
      <SafetyCaution compact />
    </div>
  );
}
