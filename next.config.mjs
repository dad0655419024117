// Next.js settings for Hearthmark. Edit when a server-only package needs bundling rules
// or a response header changes for every page.
import withSerwistInit from '@serwist/next';

/** Security headers sent with every response. The camera is allowed only under /field (photos), below. */
const securityHeaders = [
  { key: 'X-Content-Type-Options', value: 'nosniff' },
  { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
  { key: 'X-Frame-Options', value: 'DENY' },
  { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=(), payment=()' },
  {
    key: 'Content-Security-Policy',
    value: [
      "default-src 'self'",
      // Next's App Router streams its payload in inline scripts; nonces would force every page to
      // render dynamically, so inline scripts stay allowed while everything else is locked to self.
      "script-src 'self' 'unsafe-inline'",
      "style-src 'self' 'unsafe-inline'",
      "img-src 'self' data: blob:",
      "font-src 'self'",
      "connect-src 'self'",
      "worker-src 'self' blob:",
      "frame-ancestors 'none'",
      "form-action 'self' http://127.0.0.1:* http://localhost:*",
      "base-uri 'self'",
      "object-src 'none'",
    ].join('; '),
  },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  // Lets parallel checkouts or test runs build side by side (e.g. NEXT_DIST_DIR=.next-e2e2).
  distDir: process.env.NEXT_DIST_DIR || '.next',
  serverExternalPackages: ['knex', 'better-sqlite3', '@react-pdf/renderer', 'sharp', 'smtp-server', 'mailparser'],
  poweredByHeader: false,
  // npm test runs tsc over the whole project before building; checking again here only doubles the build time.
  typescript: { ignoreBuildErrors: true },
  experimental: { authInterrupts: true },
  async headers() {
    return [
      { source: '/:path*', headers: securityHeaders },
      // Later entries win for the same header: the field app may open the camera for photos.
      { source: '/field/:path*', headers: [{ key: 'Permissions-Policy', value: 'camera=(self), microphone=(), geolocation=(), payment=()' }] },
      { source: '/field', headers: [{ key: 'Permissions-Policy', value: 'camera=(self), microphone=(), geolocation=(), payment=()' }] },
    ];
  },
};

const distDir = nextConfig.distDir;
// Each build directory gets its own worker file, so builds side by side in one tree (NEXT_DIST_DIR)
// never serve each other's precache list. The app registers it through window.serwist, which
// @serwist/next points at this URL.
const swFile = distDir === '.next' ? 'sw.js' : `sw-${distDir.replace(/[^a-z0-9]+/gi, '')}.js`;

const withSerwist = withSerwistInit({
  swSrc: 'app/sw.ts',
  swDest: `public/${swFile}`,
  swUrl: `/${swFile}`,
  // Registered by the field app itself (app/(field)/field/_components/service-worker.tsx).
  register: false,
  reloadOnOnline: false,
  cacheOnNavigation: false,
  // Public files to precache, listed rather than globbed: another build's worker file must never be in the list.
  additionalPrecacheEntries: ['/offline', '/manifest.webmanifest', '/icons/icon-192.png', '/icons/icon-512.png', '/icons/maskable-192.png'].map((url) => ({ url, revision: String(Date.now()) })),
});

// The worker is built by @serwist/next's webpack plugin, so production builds run `next build --webpack`.
// `next dev` (Turbopack) gets the plain settings and no worker: service workers exist only after a build.
export default process.env.NODE_ENV === 'production' ? withSerwist(nextConfig) : nextConfig;
