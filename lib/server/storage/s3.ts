import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client, S3ServiceException, type S3ClientConfig } from '@aws-sdk/client-s3';
import { getEnv, type Env } from '../../env';
import { AppError } from '../../errors';
import { assertKey, type StorageDriver } from './types';

/**
 * The object store could not do what was asked (down, unreachable, wrong bucket or keys). The
 * message is safe to show and says what to check; 503 because waiting or fixing settings helps.
 */
export class StorageUnavailableError extends AppError {
  constructor(message: string) {
    super(503, message, 'storage_unavailable');
    this.name = 'StorageUnavailableError';
  }
}

export function isStorageUnavailable(e: unknown): e is StorageUnavailableError {
  return e instanceof StorageUnavailableError;
}

export type S3Settings = {
  endpoint?: string;
  bucket: string;
  region: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  /** Per request; a dead store must fail a request in seconds, not hang an upload. */
  timeoutMs?: number;
};

/** The S3 client's settings for a store: AWS itself, or the S3-compatible store at `endpoint`. */
export function s3ClientConfig(s: S3Settings): S3ClientConfig {
  const timeout = s.timeoutMs ?? 15_000;
  return {
    region: s.region,
    endpoint: s.endpoint,
    // self-hosted stores and the test fake serve buckets by path, not by subdomain
    forcePathStyle: Boolean(s.endpoint),
    credentials: s.accessKeyId && s.secretAccessKey ? { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey } : undefined,
    maxAttempts: 2,
    requestHandler: { connectionTimeout: Math.min(timeout, 3000), requestTimeout: timeout },
    // Self-hosted stores and the test fake may reject the newer default checksum headers, so a
    // custom endpoint sends and checks checksums only where the operation requires them. AWS keeps
    // the SDK's defaults (a checksum on every upload and download).
    ...(s.endpoint ? { requestChecksumCalculation: 'WHEN_REQUIRED' as const, responseChecksumValidation: 'WHEN_REQUIRED' as const } : {}),
  };
}

const NETWORK_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN', 'EPIPE', 'TimeoutError', 'RequestTimeout']);

/** Objects in one S3 bucket (AWS, or any S3-compatible store when S3_ENDPOINT is set). */
export class S3Storage implements StorageDriver {
  private readonly client: S3Client;
  private readonly bucket: string;
  private readonly where: string;

  constructor(s: S3Settings) {
    this.bucket = s.bucket;
    this.where = `bucket “${s.bucket}” at ${s.endpoint ?? `AWS ${s.region}`}`;
    this.client = new S3Client(s3ClientConfig(s));
  }

  async put(key: string, bytes: Uint8Array, options?: { contentType?: string }): Promise<void> {
    assertKey(key);
    await this.call('store', key, () => this.client.send(new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: bytes, ContentLength: bytes.length, ContentType: options?.contentType ?? 'application/octet-stream' })));
  }

  async get(key: string): Promise<Buffer | null> {
    assertKey(key);
    return this.call('read', key, async () => {
      try {
        const out = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
        if (!out.Body) return Buffer.alloc(0);
        return Buffer.from(await out.Body.transformToByteArray());
      } catch (e) {
        if (isMissing(e)) return null;
        throw e;
      }
    });
  }

  async stat(key: string): Promise<{ bytes: number } | null> {
    assertKey(key);
    return this.call('look up', key, async () => {
      try {
        const out = await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
        return { bytes: out.ContentLength ?? 0 };
      } catch (e) {
        if (isMissing(e)) return null;
        throw e;
      }
    });
  }

  async delete(key: string): Promise<void> {
    assertKey(key);
    await this.call('delete', key, () => this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key })));
  }

  /** Closes the client's sockets (tests, shutdown). */
  destroy(): void {
    this.client.destroy();
  }

  private async call<T>(verb: string, key: string, run: () => Promise<T>): Promise<T> {
    try {
      return await run();
    } catch (e) {
      throw this.explain(verb, key, e);
    }
  }

  // One place turns SDK and socket errors into sentences an operator can act on; the key is
  // internal and not shown, the bucket and endpoint are what they configured.
  private explain(verb: string, key: string, e: unknown): Error {
    if (e instanceof RangeError) return e;
    const name = e instanceof S3ServiceException ? e.name : (e as { name?: string })?.name;
    const code = (e as { code?: string })?.code ?? (e as { cause?: { code?: string } })?.cause?.code ?? name ?? '';
    const status = (e as { $metadata?: { httpStatusCode?: number } })?.$metadata?.httpStatusCode;
    let message: string;
    if (name === 'NoSuchBucket') {
      message = `The object store has no ${this.where}: create the bucket or fix S3_BUCKET`;
    } else if (name === 'InvalidAccessKeyId' || name === 'SignatureDoesNotMatch' || name === 'AccessDenied' || status === 403) {
      message = `The object store refused the keys for ${this.where}: check S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY and the bucket policy`;
    } else if (NETWORK_CODES.has(code) || NETWORK_CODES.has(name ?? '') || /ECONNREFUSED|socket hang up|timed? ?out/i.test(String((e as Error)?.message))) {
      message = `The object store did not answer (${this.where}, ${code || 'no response'}): it may be down; try again once it is back`;
    } else {
      message = `The object store could not ${verb} a file in ${this.where}${status ? ` (HTTP ${status})` : ''}: try again; if it persists, tell your lab admin`;
    }
    const err = new StorageUnavailableError(message);
    // the key stays in the cause for logs only
    (err as { cause?: unknown }).cause = Object.assign(e instanceof Error ? e : new Error(String(e)), { storageKey: key });
    return err;
  }
}

function isMissing(e: unknown): boolean {
  const name = (e as { name?: string })?.name;
  const status = (e as { $metadata?: { httpStatusCode?: number } })?.$metadata?.httpStatusCode;
  return name === 'NoSuchKey' || name === 'NotFound' || (status === 404 && name !== 'NoSuchBucket');
}

/** The driver from the environment; stops at start when the bucket is not set. */
export function createS3Storage(env: Env = getEnv()): S3Storage {
  if (!env.S3_BUCKET) throw new Error('STORAGE_DRIVER=s3 needs S3_BUCKET (and S3_ENDPOINT for a store other than AWS)');
  if (Boolean(env.S3_ACCESS_KEY_ID) !== Boolean(env.S3_SECRET_ACCESS_KEY)) throw new Error('Set both S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY, or neither to use the machine’s AWS credentials');
  return new S3Storage({ endpoint: env.S3_ENDPOINT, bucket: env.S3_BUCKET, region: env.S3_REGION, accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY });
}
