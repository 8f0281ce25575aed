import { fileURLToPath } from 'node:url';

// Next's own inline bootstrap scripts need 'unsafe-inline' without nonces; everything else is
// limited to this origin, and no one may frame the app.
const csp = [
  "default-src 'self'",
  "script-src 'self' 'unsafe-inline'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join('; ');

const securityHeaders = [
  { key: 'Content-Security-Policy', value: csp },
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
  experimental: { serverActions: { bodySizeLimit: '2mb' }, proxyClientMaxBodySize: '61mb' },
  async headers() {
    return [{ source: '/:path*', headers: securityHeaders }];
  },
};

export default nextConfig;
