import { pingDatabase } from '../../db/queries/connection';
import { pingRedis } from './queue/connection';

type Part = 'up' | 'down';

/** Probes PostgreSQL and Redis with short timeouts; never throws. */
export async function checkHealth(): Promise<{ db: Part; redis: Part }> {
  const timeout = <T,>(p: Promise<T>, ms: number) => Promise.race([p, new Promise<never>((_, rej) => setTimeout(() => rej(new Error('timeout')), ms))]);
  const [db, redis] = await Promise.all([
    timeout(pingDatabase(), 2000).then(() => 'up' as const, () => 'down' as const),
    timeout(pingRedis(), 2000).then(() => 'up' as const, () => 'down' as const),
  ]);
  return { db, redis };
}
