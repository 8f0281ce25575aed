import { Redis, type RedisOptions } from 'ioredis';
import { getEnv } from '../../env';

const g = globalThis as unknown as { __veilmeterProducerRedis?: Redis };

/**
 * The web app's connection: fails fast when Redis is down (no offline queue), so a request can
 * answer 503 at once instead of hanging.
 */
export function producerConnection(): Redis {
  if (!g.__veilmeterProducerRedis) {
    g.__veilmeterProducerRedis = new Redis(getEnv().REDIS_URL, {
      enableOfflineQueue: false,
      maxRetriesPerRequest: 1,
      connectTimeout: 2000,
      lazyConnect: false,
      retryStrategy: (n) => Math.min(n * 200, 2000),
    });
    g.__veilmeterProducerRedis.on('error', () => {
      // Reported through health checks and 503 answers; the client reconnects by itself.
    });
  }
  return g.__veilmeterProducerRedis;
}

/** The worker's connection: waits and retries through Redis restarts (BullMQ needs null retries). */
export function workerConnection(extra: RedisOptions = {}): Redis {
  return new Redis(getEnv().REDIS_URL, { maxRetriesPerRequest: null, enableReadyCheck: true, ...extra });
}

export async function pingRedis(): Promise<void> {
  const conn = producerConnection();
  if (conn.status !== 'ready') {
    await new Promise<void>((resolve, reject) => {
      const t = setTimeout(() => reject(new Error('redis not ready')), 1500);
      conn.once('ready', () => {
        clearTimeout(t);
        resolve();
      });
    });
  }
  await conn.ping();
}
