import { fileURLToPath } from 'node:url';

/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  serverExternalPackages: ['knex', 'bullmq', 'sharp', 'pg', 'ioredis', 'exifr'],
  turbopack: { root: fileURLToPath(new URL('.', import.meta.url)) },
  experimental: { serverActions: { bodySizeLimit: '2mb' } },
};

export default nextConfig;
