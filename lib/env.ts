import { z } from 'zod';

// The only reader of process.env. Parsed on first use, so `next build` needs no settings while a
// web or worker process with a missing one stops at its first request or job with a clear message.
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  DATABASE_URL: z.string().url({ message: 'DATABASE_URL must be a postgres:// URL' }),
  REDIS_URL: z.string().url({ message: 'REDIS_URL must be a redis:// URL' }),
  NEXTAUTH_SECRET: z.string().min(16, { message: 'NEXTAUTH_SECRET must be at least 16 characters' }),
  NEXTAUTH_URL: z.string().url().default('http://localhost:3000'),
  DATA_DIR: z.string().default('.data'),
  STORAGE_DIR: z.string().optional(),
  STORAGE_DRIVER: z.enum(['local', 's3']).default('local'),
  S3_ENDPOINT: z.string().url().optional(),
  S3_BUCKET: z.string().min(3).optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().positive().default(2529),
  MAIL_FROM: z.string().default('Veilmeter <no-reply@veilmeter.example.test>'),
  QUEUE_PREFIX: z.string().default('vm'),
  WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(16).default(1),
  VEILMETER_TEST: z.string().optional(),
  /** Set by the start and test scripts when mail goes to the local catcher: enables the inbox page. */
  MAIL_CATCHER: z.enum(['0', '1']).default('0'),
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

/** Parses the environment once and returns the typed settings. */
export function getEnv(): Env {
  if (cached) return cached;
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
    throw new Error(`Veilmeter settings are incomplete:\n  ${lines.join('\n  ')}`);
  }
  cached = parsed.data;
  return cached;
}

export function storageDir(env: Env = getEnv()): string {
  return env.STORAGE_DIR ?? `${env.DATA_DIR}/storage`;
}
