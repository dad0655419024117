'use client';
// Registers the service worker built by @serwist/next (window.serwist points at it), offers the
// new version when one is waiting, and fetches the field pages ahead so each visit opens offline.
import { useEffect, useState } from 'react';
import type { Serwist } from '@serwist/window';
import { Button } from '@/components/ui/button';

declare global {
  interface Window {
    serwist?: Serwist;
  }
}

let registered = false;
const warmed = new Set<string>();

function whenControlled(): Promise<void> {
  if (!('serviceWorker' in navigator)) return Promise.reject(new Error('no service worker'));
  if (navigator.serviceWorker.controller) return Promise.resolve();
  return new Promise((resolve) => navigator.serviceWorker.addEventListener('controllerchange', () => resolve(), { once: true }));
}

/**
 * Fetches pages through the service worker so it keeps a copy of each: the page the app opened
 * before the worker was installed, and every visit on the list, which the engineer may first open
 * in a cellar. One at a time, once per page per session.
 */
export async function warmPages(urls: string[]): Promise<void> {
  if (typeof window === 'undefined' || !window.serwist) return;
  try {
    await whenControlled();
  } catch {
    return;
  }
  for (const url of urls) {
    if (warmed.has(url) || !navigator.onLine) continue;
    warmed.add(url);
    try {
      await fetch(url, { credentials: 'same-origin', headers: { accept: 'text/html' } });
    } catch {
      warmed.delete(url);
    }
  }
}

export function ServiceWorkerRegistration() {
  const [waiting, setWaiting] = useState(false);
  const [reloading, setReloading] = useState(false);

  useEffect(() => {
    const sw = window.serwist;
    if (!sw) return;
    const onWaiting = () => setWaiting(true);
    sw.addEventListener('waiting', onWaiting);
    if (!registered) {
      registered = true;
      void sw.register().catch(() => {
        registered = false;
      });
    }
    // A phone left open for days still learns of a new version when brought back to the front.
    const onVisible = () => {
      if (document.visibilityState === 'visible' && navigator.onLine) void sw.update().catch(() => undefined);
    };
    document.addEventListener('visibilitychange', onVisible);
    return () => {
      sw.removeEventListener('waiting', onWaiting);
      document.removeEventListener('visibilitychange', onVisible);
    };
  }, []);

  if (!waiting) return null;
  const reload = () => {
    const sw = window.serwist;
    if (!sw) return;
    setReloading(true);
    sw.addEventListener('controlling', () => window.location.reload());
    sw.messageSkipWaiting();
  };
  return (
    <div role="status" className="fixed inset-x-0 top-0 z-40 mx-auto max-w-2xl p-2" data-testid="update-prompt">
      <div className="flex items-center gap-3 rounded-xl border border-copper bg-copper-soft p-3 shadow-lg">
        <p className="flex-1 text-sm">
          <span className="font-bold">A new version of the field app is ready.</span> Everything you recorded stays on this phone.
        </p>
        <Button onClick={reload} disabled={reloading}>
          {reloading ? 'Reloading…' : 'Reload'}
        </Button>
      </div>
    </div>
  );
}
