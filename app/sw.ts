// The field app's service worker, bundled by @serwist/next at `next build --webpack`. It precaches
// the app shell (every built script and style, the offline page, icons and manifest) so the field
// app opens without a network after one online visit, keeps the engineer's pages network-first,
// and waits for the engineer's word before a new version takes over ("update available").
/// <reference lib="webworker" />
import { defaultCache } from '@serwist/next/worker';
import { NetworkFirst, NetworkOnly, Serwist, type PrecacheEntry, type SerwistGlobalConfig, type SerwistPlugin } from 'serwist';

declare global {
  interface WorkerGlobalScope extends SerwistGlobalConfig {
    __SW_MANIFEST: (PrecacheEntry | string)[] | undefined;
  }
}

declare const self: ServiceWorkerGlobalScope;

// Only a page that really rendered is kept: never a redirect to sign-in or an error page, which
// would otherwise be shown offline in place of the visit.
const onlyRealPages: SerwistPlugin = {
  cacheWillUpdate: async ({ response }) => (response.status === 200 && !response.redirected ? response : null),
};

const isFieldPath = (pathname: string) => pathname === '/field' || pathname.startsWith('/field/');

const serwist = new Serwist({
  precacheEntries: self.__SW_MANIFEST,
  // A new version waits until the engineer taps "Reload" (never mid-recording).
  skipWaiting: false,
  // The first install takes the open page straight away, so it works offline without a reload.
  clientsClaim: true,
  navigationPreload: false,
  runtimeCaching: [
    // The app's own data and uploads go to the network only: IndexedDB is the offline copy.
    { matcher: ({ sameOrigin, url }) => sameOrigin && url.pathname.startsWith('/api/'), handler: new NetworkOnly() },
    // Field pages (opened, or fetched ahead by the app for every visit on the list): network first,
    // with a short timeout so a weak cellar signal falls back to the saved page quickly.
    {
      matcher: ({ request, sameOrigin, url }) => sameOrigin && request.method === 'GET' && isFieldPath(url.pathname) && request.headers.get('RSC') !== '1',
      handler: new NetworkFirst({ cacheName: 'field-pages', networkTimeoutSeconds: 4, plugins: [onlyRealPages], matchOptions: { ignoreVary: true, ignoreSearch: true } }),
    },
    ...defaultCache,
  ],
  fallbacks: {
    entries: [{ url: '/offline', matcher: ({ request }) => request.destination === 'document' }],
  },
});

serwist.addEventListeners();
