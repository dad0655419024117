// Next.js settings for Hearthmark. Edit when a server-only package needs bundling rules
// or a response header changes for every page.

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

export default nextConfig;
