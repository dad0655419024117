import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getSiteDetail } from '@/db/sites';
import { ApplianceForm } from '../../../_components/appliance-form';

export const metadata: Metadata = { title: 'Add appliance' };

export default async function NewAppliancePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  const site = await getSiteDetail(user.organisationId, id);
  if (!site) notFound();
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Add an appliance at {site.reference}</h1>
      <ApplianceForm initial={{ siteId: site.id, category: 'boiler', fuel: 'natural-gas', flueType: 'room_sealed', location: '', make: '', model: '', serial: '', ratedInputKw: '', mfrRatioMax: '', mfrCoAirFreeMaxPpm: '', mfrCoMaxPpm: '' }} />
    </div>
  );
}
