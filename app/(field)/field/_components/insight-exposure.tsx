'use client';
// Beside a room CO check: what the reading means for the people breathing it (an estimate, not a
// diagnosis). Open from the start when the reading is over the room CO rule, a tap away otherwise.
// The panel and its maths load only when opened, keeping them off the visit screen's first load; the
// service worker precaches every built script, so it opens offline too.
import dynamic from 'next/dynamic';
import { useState } from 'react';
import type { LimitContext } from '@/lib/field';

const RoomExposurePanel = dynamic(() => import('./insight-exposure-panel').then((m) => m.RoomExposurePanel), {
  ssr: false,
  loading: () => <p className="text-sm text-ink-soft">Working out the estimate…</p>,
});

export function RoomExposure({ room, coPpm, minutes, limits, date, high }: { room: string; coPpm: number; minutes: number | null; limits: LimitContext; date: string; high: boolean }) {
  const [open, setOpen] = useState(high);
  return (
    <div className="flex flex-col gap-2">
      <button
        type="button"
        aria-expanded={open}
        onClick={() => setOpen((v) => !v)}
        className="min-h-11 self-start text-sm font-semibold text-copper-dark underline"
        data-testid="exposure-toggle"
      >
        {open ? 'Hide exposure estimate' : 'Exposure estimate (not a diagnosis)'}
      </button>
      {open ? <RoomExposurePanel room={room} coPpm={coPpm} minutes={minutes} limits={limits} date={date} /> : null}
    </div>
  );
}
