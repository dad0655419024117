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

/**
 * Entry points whose scripts the field app needs offline: the root layout, the (field) group (its
 * layout, /field, the visit screen, /offline), the App Router runtime and its built-in error and
 * not-found pages. The office, the portal, sign-in and the Pages Router fallbacks (framework,
 * main) are never opened in a cellar, so their scripts stay out of the precache.
 */
const FIELD_ENTRY = /^(main-app$|app\/layout$|app\/(_not-found|_global-error)\/page$|app\/(not-found|forbidden)$|next\/dist\/client\/components\/builtin\/|app\/\(field\)\/)/;

/** The manifest group Next files an App Router entry under: its folder, with route groups left out. */
const nextGroupName = (entryName) => entryName.slice(0, entryName.lastIndexOf('/')).replace(/\/\([^/]+\)(?=(\/|$))/g, '');

/** Asset names (relative to the dist dir) in the chunks the field entry points load, with their dynamic imports. */
const fieldAssetsByCompilation = new WeakMap();
function fieldAssets(compilation) {
  let names = fieldAssetsByCompilation.get(compilation);
  if (names) return names;
  names = { field: new Set(), chunked: new Set() };
  const filesOf = (chunk) => [...chunk.files, ...(chunk.auxiliaryFiles ?? [])];
  const seen = new Set();
  const visit = (group, withChildren) => {
    if (seen.has(group)) return;
    seen.add(group);
    for (const chunk of group.chunks) for (const file of filesOf(chunk)) names.field.add(file);
    if (withChildren) for (const child of group.getChildren()) visit(child, true);
  };
  // main-app's async children are every route of the app (the router loads them on demand): only
  // its own chunks count. A field route's children are its own dynamic imports (photos, visit parts).
  for (const [name, entry] of compilation.entrypoints) if (FIELD_ENTRY.test(name)) visit(entry, name !== 'main-app');
  // Next merges the client manifests of every entry in a page's group and its parent groups, with
  // route groups dropped: a root group layout such as (portal)/layout shares the root's manifest, so
  // a field page may be told to load that layout's (tiny) chunk for a shared module like next/link.
  const fieldGroups = new Set();
  for (const name of compilation.entrypoints.keys()) {
    if (!name.startsWith('app/(field)/')) continue;
    const parts = nextGroupName(name).split('/');
    for (let i = 1; i <= parts.length; i++) fieldGroups.add(parts.slice(0, i).join('/'));
  }
  for (const [name, entry] of compilation.entrypoints) if (name.startsWith('app/') && fieldGroups.has(nextGroupName(name))) visit(entry, false);
  for (const chunk of compilation.chunks) for (const file of filesOf(chunk)) names.chunked.add(file);
  fieldAssetsByCompilation.set(compilation, names);
  return names;
}

/** Leaves out any built script, style or font that only non-field pages load. */
const notForTheField = ({ asset, compilation }) => {
  const names = fieldAssets(compilation);
  return names.chunked.has(asset.name) && !names.field.has(asset.name);
};

const withSerwist = withSerwistInit({
  swSrc: 'app/sw.ts',
  swDest: `public/${swFile}`,
  swUrl: `/${swFile}`,
  // Registered by the field app itself (app/(field)/field/_components/service-worker.tsx).
  register: false,
  reloadOnOnline: false,
  cacheOnNavigation: false,
  // Public files to precache, listed rather than globbed: another build's worker file must never be in the list.
  // Serwist's defaults (source maps, manifest scripts), the office and portal's scripts, and the
  // polyfills only browsers without ES modules load (none of which runs a service worker worth it).
  exclude: [/\.map$/, /^manifest.*\.js$/, /^static\/chunks\/polyfills-/, notForTheField],
  additionalPrecacheEntries: ['/offline', '/manifest.webmanifest', '/icons/icon-192.png', '/icons/icon-512.png', '/icons/maskable-192.png'].map((url) => ({ url, revision: String(Date.now()) })),
});

// The worker is built by @serwist/next's webpack plugin, so production builds run `next build --webpack`.
// `next dev` (Turbopack) gets the plain settings and no worker: service workers exist only after a build.
export default process.env.NODE_ENV === 'production' ? withSerwist(nextConfig) : nextConfig;
