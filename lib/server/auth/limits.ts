import { RateLimiterMemory, RateLimiterRedis, RateLimiterRes } from 'rate-limiter-flexible';
import { getEnv } from '../../env';
import { producerConnection } from '../queue/connection';
import { RateLimited } from '../security/rate-limit';

type Limit = { points: number; duration: number };

/**
 * Limits on the public account routes, per key within `duration` seconds. Sign-in failures are
 * counted three ways so an attacker is slowed without locking the owner out:
 * - one client on one address: 10 failures, then 429 for that client only;
 * - one client on any address: 100 failures (spraying many addresses);
 * - one address from every client together: no lock, but from the 10th failure on each try on
 *   that address waits first, twice as long each time up to 10 s (signInDelayMs), so the owner on
 *   another client still gets in, a few seconds later at worst.
 * A success gives back the client's failure and clears the other two counters.
 */
export const AUTH_LIMITS = {
  signInPair: { points: 10, duration: 15 * 60 },
  signInClient: { points: 100, duration: 15 * 60 },
  signInAddress: { points: 1_000_000, duration: 15 * 60 },
  signUpClient: { points: 10, duration: 60 * 60 },
  signUpAddress: { points: 3, duration: 60 * 60 },
  inviteClient: { points: 20, duration: 15 * 60 },
  inviteToken: { points: 10, duration: 15 * 60 },
  verifyResend: { points: 3, duration: 60 * 60 },
} satisfies Record<string, Limit>;

export type AuthLimit = keyof typeof AUTH_LIMITS;

const g = globalThis as unknown as { __veilmeterAuthLimiters?: Map<string, RateLimiterRedis> };

function limiter(name: AuthLimit): RateLimiterRedis {
  const all = (g.__veilmeterAuthLimiters ??= new Map());
  const prefix = `${getEnv().QUEUE_PREFIX}:rl:auth:${name}`;
  let l = all.get(prefix);
  if (!l) {
    const { points, duration } = AUTH_LIMITS[name];
    // counters live in Redis so every web process shares them; a per-process one stands in while Redis is away
    l = new RateLimiterRedis({ storeClient: producerConnection(), keyPrefix: prefix, points, duration, insuranceLimiter: new RateLimiterMemory({ points, duration }) });
    all.set(prefix, l);
  }
  return l;
}

/** Counts one attempt against every named key, in order; throws RateLimited at the first one exhausted. */
export async function spend(checks: [AuthLimit, string][]): Promise<void> {
  for (const [name, key] of checks) {
    try {
      await limiter(name).consume(key);
    } catch (err) {
      if (err instanceof RateLimiterRes) throw new RateLimited(Math.max(1, Math.ceil(err.msBeforeNext / 1000)));
      throw err;
    }
  }
}

/** Gives one attempt back (a success that should not count as a failure). */
export async function giveBack(name: AuthLimit, key: string): Promise<void> {
  await limiter(name).reward(key, 1).catch(() => undefined);
}

export async function clear(name: AuthLimit, key: string): Promise<void> {
  await limiter(name).delete(key).catch(() => undefined);
}

/** Attempts counted on a key in its current window. */
export async function spent(name: AuthLimit, key: string): Promise<number> {
  const res = await limiter(name).get(key).catch(() => null);
  return res?.consumedPoints ?? 0;
}

export const SIGN_IN_DELAY_AFTER = 10;
const SIGN_IN_DELAY_FIRST_MS = 250;
export const SIGN_IN_DELAY_MAX_MS = 10_000;

/** How long a sign-in on an address waits after `failures` failed ones on it from all clients. */
export function signInDelayMs(failures: number): number {
  if (failures < SIGN_IN_DELAY_AFTER) return 0;
  return Math.min(SIGN_IN_DELAY_MAX_MS, SIGN_IN_DELAY_FIRST_MS * 2 ** (failures - SIGN_IN_DELAY_AFTER));
}

/** The form of an address that limits use: what sign-in, sign-up and reset look up (trimmed, lower case). */
export function addressKey(email: unknown): string {
  return typeof email === 'string' ? email.trim().toLowerCase() : '';
}
