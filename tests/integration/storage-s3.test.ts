// The S3 driver against the S3-compatible fake: the one npm test starts (S3_ENDPOINT), or a private
// one when this file runs on its own.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { S3Client } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { toErrorResponse } from '../../lib/errors';
import { createS3Storage, isStorageUnavailable, s3ClientConfig, S3Storage } from '../../lib/server/storage/s3';
import type { Env } from '../../lib/env';
import { freePort } from '../fixtures/free-port';

const tmp = mkdtempSync(join(tmpdir(), 'vm-s3-'));
let fake: ChildProcess | undefined;
let endpoint = process.env.S3_ENDPOINT ?? '';
let bucket = process.env.S3_BUCKET ?? 'vm-s3-test';
let store: S3Storage;
const drivers: S3Storage[] = [];
const driver = (over: Partial<ConstructorParameters<typeof S3Storage>[0]> = {}) => {
  const d = new S3Storage({ endpoint, bucket, region: 'us-east-1', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER', timeoutMs: 3000, ...over });
  drivers.push(d);
  return d;
};

beforeAll(async () => {
  if (!endpoint) {
    endpoint = `http://127.0.0.1:${await freePort()}`;
    bucket = 'vm-s3-test';
    fake = spawn(process.execPath, ['--import', 'tsx', 'scripts/s3-fake.ts'], { env: { ...process.env, DATA_DIR: tmp, S3_ENDPOINT: endpoint, S3_BUCKET: bucket }, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
    await new Promise<void>((resolve, reject) => {
      const t = setTimeout(() => reject(new Error('S3 fake did not start')), 20_000);
      fake?.stdout?.on('data', (d: Buffer) => {
        if (d.toString().includes('ready')) {
          clearTimeout(t);
          resolve();
        }
      });
    });
  }
  store = driver();
});

afterAll(() => {
  for (const d of drivers) d.destroy();
  if (fake?.pid) {
    try {
      process.kill(-fake.pid, 'SIGTERM');
    } catch {
      // already gone
    }
  }
  rmSync(tmp, { recursive: true, force: true });
});

describe('S3 storage driver', () => {
  const key = `photos/${Math.random().toString(36).slice(2, 10)}/one.jpg`;

  it('stores, reads, sizes and deletes a whole object by key', async () => {
    const bytes = new Uint8Array(200_000).map((_, i) => (i * 7) & 255);
    await store.put(key, bytes, { contentType: 'image/jpeg' });
    expect(await store.stat(key)).toEqual({ bytes: 200_000 });
    const back = await store.get(key);
    expect(back?.equals(Buffer.from(bytes))).toBe(true);
    await store.delete(key);
    expect(await store.stat(key)).toBeNull();
  });

  it('answers null for a missing object and treats deleting one as done', async () => {
    expect(await store.get('photos/none/missing.jpg')).toBeNull();
    expect(await store.stat('photos/none/missing.jpg')).toBeNull();
    await expect(store.delete('photos/none/missing.jpg')).resolves.toBeUndefined();
  });

  it('refuses keys that were not made by the app', async () => {
    await expect(store.put('../etc/passwd', new Uint8Array(1))).rejects.toBeInstanceOf(RangeError);
    await expect(store.get('photos/a/../../b.jpg')).rejects.toBeInstanceOf(RangeError);
  });

  it('names the missing bucket in a clear message', async () => {
    const err = await driver({ bucket: 'no-such-bucket' }).put('photos/x/a.jpg', new Uint8Array(3)).catch((e: unknown) => e);
    expect(isStorageUnavailable(err)).toBe(true);
    expect((err as Error).message).toMatch(/no bucket “no-such-bucket”.*S3_BUCKET/);
  });

  it('fails within seconds with a clear 503 when the store is not there', async () => {
    const down = driver({ endpoint: `http://127.0.0.1:${await freePort()}` });
    const t0 = Date.now();
    const err = await down.get('photos/x/a.jpg').catch((e: unknown) => e);
    expect(Date.now() - t0).toBeLessThan(5000);
    expect((err as Error).message).toMatch(/object store did not answer .*ECONNREFUSED/);
    const { status, body } = toErrorResponse(err);
    expect(status).toBe(503);
    expect(body.error.code).toBe('storage_unavailable');
  });

  it('is chosen only with a bucket set, and wants both keys or neither', () => {
    const base = { S3_REGION: 'us-east-1', S3_ENDPOINT: endpoint } as Env;
    expect(() => createS3Storage({ ...base })).toThrow(/S3_BUCKET/);
    expect(() => createS3Storage({ ...base, S3_BUCKET: 'abc', S3_ACCESS_KEY_ID: 'k' })).toThrow(/both/);
    const d = createS3Storage({ ...base, S3_BUCKET: 'abc', S3_ACCESS_KEY_ID: 'k', S3_SECRET_ACCESS_KEY: 's' });
    expect(d).toBeInstanceOf(S3Storage);
    d.destroy();
  });

  it('relaxes checksums only for a custom endpoint: AWS keeps the SDK defaults', async () => {
    const aws = new S3Client(s3ClientConfig({ bucket: 'abc', region: 'eu-west-1' }));
    const custom = new S3Client(s3ClientConfig({ bucket: 'abc', region: 'eu-west-1', endpoint }));
    try {
      // the SDK's default for AWS: a checksum on every upload, and answers checked when they carry one
      expect(await aws.config.requestChecksumCalculation()).toBe('WHEN_SUPPORTED');
      expect(await aws.config.responseChecksumValidation()).toBe('WHEN_SUPPORTED');
      expect(aws.config.forcePathStyle).toBe(false);
      expect(await custom.config.requestChecksumCalculation()).toBe('WHEN_REQUIRED');
      expect(await custom.config.responseChecksumValidation()).toBe('WHEN_REQUIRED');
      expect(custom.config.forcePathStyle).toBe(true);
    } finally {
      aws.destroy();
      custom.destroy();
    }
  });
});
