import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getAppliance } from '@/db/appliances';
import type { ApplianceInput } from '@/lib/validations/appliances';
import { ApplianceForm } from '../../../_components/appliance-form';

export const metadata: Metadata = { title: 'Appliance' };

export default async function AppliancePage({ params }: { params: Promise<{ id: string; applianceId: string }> }) {
  const user = await requirePageRole(['office']);
  const { id, applianceId } = await params;
  const a = await getAppliance(user.organisationId, applianceId);
  if (!a || a.siteId !== id) notFound();
  const n = (v: number | null) => (v === null ? '' : String(v));
  const initial = {
    siteId: a.siteId, category: a.category, fuel: a.fuel, flueType: a.flueType, location: a.location, make: a.make ?? '', model: a.model ?? '', serial: a.serial ?? '',
    ratedInputKw: n(a.ratedInputKw), mfrRatioMax: n(a.mfrRatioMax), mfrCoAirFreeMaxPpm: n(a.mfrCoAirFreeMaxPpm), mfrCoMaxPpm: n(a.mfrCoMaxPpm),
  } as ApplianceInput;
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">{a.location} at {a.siteReference}</h1>
      <ApplianceForm id={a.id} initial={initial} />
    </div>
  );
}
