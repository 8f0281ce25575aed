import { RateLimiterMemory, RateLimiterRedis, RateLimiterRes } from 'rate-limiter-flexible';
import { getEnv } from '../../env';
import { producerConnection } from '../queue/connection';
import { RateLimited } from './rate-limit';

// Budgets of work per client, where one request may cost more than another: `points` within
// `duration` seconds. Counted in Redis so every web process shares them; per process if Redis is down.
export const WORK_BUDGETS = {
  /** Public test patterns: requests of any kind, cached or not. */
  patternRequests: { points: 240, duration: 60 },
  /** Public test patterns drawn afresh, in megapixels: two 8192 × 8192 renders a minute, or sixty at 1920 × 1080. */
  patternMegapixels: { points: 140, duration: 60 },
} satisfies Record<string, { points: number; duration: number }>;

export type BudgetName = keyof typeof WORK_BUDGETS;

const g = globalThis as unknown as { __veilmeterWorkLimiters?: Map<string, RateLimiterRedis> };

function limiter(name: BudgetName): RateLimiterRedis {
  const prefix = `${getEnv().QUEUE_PREFIX}:work:${name}`;
  const all = (g.__veilmeterWorkLimiters ??= new Map());
  let l = all.get(prefix);
  if (!l) {
    const { points, duration } = WORK_BUDGETS[name];
    l = new RateLimiterRedis({ storeClient: producerConnection(), keyPrefix: prefix, points, duration, insuranceLimiter: new RateLimiterMemory({ points, duration }) });
    all.set(prefix, l);
  }
  return l;
}

/** Spends `points` of the client's budget; throws RateLimited (429 with Retry-After) when it would run out. */
export async function spend(name: BudgetName, client: string, points = 1): Promise<void> {
  try {
    await limiter(name).consume(client, Math.max(1, Math.ceil(points)));
  } catch (err) {
    if (err instanceof RateLimiterRes) throw new RateLimited(Math.max(1, Math.ceil(err.msBeforeNext / 1000)));
    throw err;
  }
}
