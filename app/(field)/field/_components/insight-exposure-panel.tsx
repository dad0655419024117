'use client';
// Loaded on demand by insight-exposure.tsx: the room CO exposure estimate for one room check, with
// the room CO rule of the site's jurisdiction on the visit's date, from the limits cached offline.
import { ExposurePanel } from '@/components/insight/exposure-panel';
import { jurisdictionRoomLimitOn } from '@/lib/exposure';
import type { LimitContext } from '@/lib/field';

export function RoomExposurePanel({ room, coPpm, minutes, limits, date }: { room: string; coPpm: number; minutes: number | null; limits: LimitContext; date: string }) {
  return <ExposurePanel room={room} coPpm={coPpm} minutes={minutes} jurisdiction={jurisdictionRoomLimitOn({ ...limits, date })} />;
}
