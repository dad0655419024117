import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/session';
import { getRoomCheckSource } from '@/db/insight';
import { jurisdictionRoomLimitOn } from '@/lib/exposure';
import { ExposurePanel } from '@/components/insight/exposure-panel';
import { SafetyCaution } from '@/components/safety/caution';

export const metadata: Metadata = { title: 'Room CO exposure' };

const ID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export default async function RoomCheckExposurePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageRole(['office']);
  const { id } = await params;
  if (!ID.test(id)) notFound();
  const check = await getRoomCheckSource({ organisationId: user.organisationId, roomCheckId: id });
  if (!check) notFound();
  const jurisdiction = jurisdictionRoomLimitOn({ ...check.limitContext, date: check.takenAt.slice(0, 10) });
  return (
    <div className="flex flex-col gap-4">
      <header>
        <p className="text-sm text-ink-soft">
          {check.siteReference} · {check.siteAddress} · measured {check.takenAt.slice(0, 10)}
        </p>
        <h1 className="text-2xl font-bold">Room CO: what it means for the occupants</h1>
      </header>
      <ExposurePanel room={check.room} coPpm={check.coPpm} minutes={check.minutes} jurisdiction={jurisdiction} />
      <SafetyCaution compact />
    </div>
  );
}
