// A local S3-compatible store on 127.0.0.1 for tests and trying STORAGE_DRIVER=s3 on one machine.
// Listens on the port of S3_ENDPOINT, serves the bucket S3_BUCKET (created if missing) and keeps
// the objects under DATA_DIR/s3. Accepts only the fake's own keys: S3RVER / S3RVER. The server is
// @20minutes/s3rver (a maintained continuation of s3rver: real HTTP, S3 signatures checked), a
// development dependency: production installs (npm ci --omit=dev) do not have it.
import { mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { getEnv } from '../lib/env';

type S3rverOptions = { address: string; port: number; silent: boolean; directory: string; configureBuckets: { name: string; configs: string[] }[]; vhostBuckets: boolean };
type S3rverInstance = { run(): Promise<{ address: string; port: number }>; close(): Promise<void> };
// the package ships no types; this is the part of its API used here
const S3rver = createRequire(import.meta.url)('@20minutes/s3rver') as new (o: S3rverOptions) => S3rverInstance;

const env = getEnv();
const endpoint = new URL(env.S3_ENDPOINT ?? 'http://127.0.0.1:4568');
if (endpoint.hostname !== '127.0.0.1' && endpoint.hostname !== 'localhost') {
  console.error(`[s3-fake] S3_ENDPOINT must be on loopback, not ${endpoint.hostname}`);
  process.exit(2);
}
const bucket = env.S3_BUCKET ?? 'veilmeter';
const directory = join(env.DATA_DIR, 's3');
mkdirSync(directory, { recursive: true });

const server = new S3rver({ address: '127.0.0.1', port: Number(endpoint.port || 80), silent: true, directory, configureBuckets: [{ name: bucket, configs: [] }], vhostBuckets: false });

server
  .run()
  .then((a) => console.log(`[s3-fake] ready on http://${a.address}:${a.port}, bucket ${bucket}, data in ${directory}`))
  .catch((err: unknown) => {
    console.error(`[s3-fake] could not start: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  });

const stop = () => {
  server.close().finally(() => process.exit(0));
  setTimeout(() => process.exit(0), 2000).unref();
};
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
