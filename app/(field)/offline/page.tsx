import type { Metadata } from 'next';
import { HearthMark } from '@/components/brand/hearth-mark';

export const metadata: Metadata = { title: 'Offline' };
// Built once and precached by the service worker: shown when a page was not saved for offline use.
export const dynamic = 'force-static';

export default function OfflinePage() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center gap-4 px-4">
      <HearthMark />
      <h1 className="text-2xl font-bold">No connection</h1>
      <p>This page was not saved on this phone, so it cannot open without a signal.</p>
      <p>
        Everything you recorded is safe on this phone and will be sent when the signal is back. Your visits were saved when you last
        opened the app online.
      </p>
      {/* A plain link: a full page load lets the service worker answer from its saved copy. */}
      <a href="/field" className="inline-flex min-h-12 items-center justify-center rounded-lg bg-copper px-4 text-base font-semibold text-white">
        Open My visits
      </a>
    </main>
  );
}
