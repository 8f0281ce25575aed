import { isIP } from 'node:net';
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
  /** The SMTP relay mail goes to when the local catcher is off (MAIL_CATCHER=0). Unset: no mail is sent. */
  SMTP_HOST: z.string().trim().min(1).optional(),
  /** The relay's port (587 for STARTTLS, 465 for SMTP_TLS=tls); with the catcher on, the catcher's port. */
  SMTP_PORT: z.coerce.number().int().positive().max(65535).default(2529),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  /** starttls: upgrade a plain connection and refuse to go on without TLS; tls: TLS from the first byte; none: never (a relay on loopback only). */
  SMTP_TLS: z.enum(['starttls', 'tls', 'none']).default('starttls'),
  MAIL_FROM: z.string().default('Veilmeter <no-reply@veilmeter.example.test>'),
  QUEUE_PREFIX: z.string().default('vm'),
  WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(16).default(1),
  VEILMETER_TEST: z.string().optional(),
  /**
   * 1 only for the demo and tests (`npm start`, `npm test` ask for it): mail goes to the local catcher
   * on 127.0.0.1:SMTP_PORT instead of a relay, and the inbox page shows each person their own mail.
   */
  MAIL_CATCHER: z.enum(['0', '1']).default('0'),
  /** 1 lets webhooks post to loopback and private addresses in production (lib/webhooks/url-policy.ts). */
  WEBHOOKS_ALLOW_PRIVATE: z.enum(['0', '1']).default('0'),
  /**
   * Comma-separated addresses of the reverse proxies in front of the web app; only their
   * X-Forwarded-For counts when limits pick the client's address (lib/security/client-ip.ts).
   */
  TRUSTED_PROXIES: z
    .string()
    .default('')
    .transform((s) => s.split(',').map((x) => x.trim()).filter((x) => x !== ''))
    .refine((list) => list.every((x) => isIP(x.replace(/^\[|\]$/g, '')) !== 0), { message: 'TRUSTED_PROXIES must be IP addresses separated by commas' }),
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
