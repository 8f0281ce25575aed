import { fileURLToPath } from 'node:url';

// Pages get their Content-Security-Policy from proxy.ts, with a fresh script nonce per request
// (lib/security/headers.ts); API answers are data: they run no script and embed nothing foreign.
const apiCsp = "default-src 'self'; script-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

const securityHeaders = [
  { key: 'X-Content-Type-Options', value: 'nosniff' },
  { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
  { key: 'X-Frame-Options', value: 'DENY' },
  { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=()' },
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  // Lets parallel builds (one per engineer or test run) keep their own output folder.
  distDir: process.env.NEXT_DIST_DIR || '.next',
  // scripts/web.mjs compresses instead, leaving answers that come compressed already (the read
  // cache keeps its bodies gzipped) as they are; Next's own compression would gzip them again
  compress: false,
  reactStrictMode: true,
  poweredByHeader: false,
  // `npm test` runs tsc over the whole tree as its own step; the build need not repeat it.
  typescript: { ignoreBuildErrors: true },
  serverExternalPackages: ['knex', 'bullmq', 'sharp', 'pg', 'ioredis', 'exifr', 'pdfkit'],
  turbopack: { root: fileURLToPath(new URL('.', import.meta.url)) },
  // Photos of up to 60 MB pass through proxy.ts on their way to the upload route.
  // authInterrupts: forbidden() answers 403 for a page of the person's own lab that their role may not see
  experimental: { serverActions: { bodySizeLimit: '2mb' }, proxyClientMaxBodySize: '61mb', authInterrupts: true },
  async headers() {
    return [
      { source: '/:path*', headers: securityHeaders },
      { source: '/api/:path*', headers: [{ key: 'Content-Security-Policy', value: apiCsp }] },
    ];
  },
};

export default nextConfig;
