import { RateLimiterMemory, RateLimiterRedis, RateLimiterRes } from 'rate-limiter-flexible';
import { getEnv } from '../../env';
import { clientAddress } from '../../security/client-ip';
import { producerConnection } from '../queue/connection';

type Limits = { points: number; duration: number; blockDuration?: number };

// Per key: attempts allowed within `duration` seconds. Counters live in Redis so every web
// process shares them; if Redis is unreachable a per-process memory limiter stands in.
export const LIMITS = {
  signInAddress: { points: 10, duration: 15 * 60 },
  signInIp: { points: 300, duration: 15 * 60 },
  resetAddress: { points: 3, duration: 60 * 60 },
  resetIp: { points: 20, duration: 60 * 60 },
  tokenApi: { points: 600, duration: 60 },
} satisfies Record<string, Limits>;

export type LimitName = keyof typeof LIMITS;

const limiters = new Map<LimitName, RateLimiterRedis>();

function limiter(name: LimitName): RateLimiterRedis {
  let l = limiters.get(name);
  if (!l) {
    const { points, duration } = LIMITS[name];
    l = new RateLimiterRedis({
      storeClient: producerConnection(),
      keyPrefix: `${getEnv().QUEUE_PREFIX}:rl:${name}`,
      points,
      duration,
      insuranceLimiter: new RateLimiterMemory({ points, duration }),
    });
    limiters.set(name, l);
  }
  return l;
}

export class RateLimited extends Error {
  constructor(readonly retryAfterS: number) {
    super('Too many attempts');
  }
}

/** Counts one attempt against every named key; throws RateLimited when any is exhausted. */
export async function consume(checks: [LimitName, string][]): Promise<void> {
  for (const [name, key] of checks) {
    try {
      await limiter(name).consume(key.toLowerCase());
    } catch (err) {
      if (err instanceof RateLimiterRes) throw new RateLimited(Math.max(1, Math.ceil(err.msBeforeNext / 1000)));
      throw err;
    }
  }
}

export async function resetLimit(name: LimitName, key: string): Promise<void> {
  await limiter(name).delete(key.toLowerCase()).catch(() => undefined);
}

/** The client's address: the socket's peer, or what a proxy listed in TRUSTED_PROXIES reports (lib/security/client-ip.ts). */
export function clientIp(req: Request): string {
  return clientAddress(req);
}
