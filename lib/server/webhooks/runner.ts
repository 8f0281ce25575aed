import { Queue, Worker, type Job } from 'bullmq';
import type { Redis } from 'ioredis';
import { listPendingDeliveries } from '../../../db/queries/webhooks';
import { deliverWebhook } from './deliver';

export const WEBHOOK_QUEUE = 'webhooks';
/** Attempts per delivery; with the exponential backoff below the last comes about 8.5 minutes after the first. */
export const WEBHOOK_ATTEMPTS = 8;

type DeliveryJob = { deliveryId: string; labId: string };

/** Private and loopback receivers are for development and tests, or when an admin allows them. */
export function webhooksMayReachPrivate(env: { NODE_ENV: string; WEBHOOKS_ALLOW_PRIVATE: '0' | '1' }): boolean {
  return env.NODE_ENV !== 'production' || env.WEBHOOKS_ALLOW_PRIVATE === '1';
}

/**
 * The worker's webhook side: a sweep that queues pending deliveries (the triggers of migration
 * 20270205100000 write them), and a BullMQ worker that posts each one and retries with exponential
 * backoff. The job id is the delivery's, so a delivery waiting or retrying is never queued twice.
 */
export function startWebhookDelivery(o: { connection: Redis; prefix: string; allowPrivate: boolean; sweepMs?: number; backoffMs?: number; attempts?: number }): { close: () => Promise<void>; sweep: () => Promise<number> } {
  const queue = new Queue<DeliveryJob>(WEBHOOK_QUEUE, { connection: o.connection, prefix: o.prefix });
  const worker = new Worker<DeliveryJob>(
    WEBHOOK_QUEUE,
    async (job: Job<DeliveryJob>) => {
      const final = job.attemptsMade + 1 >= (job.opts.attempts ?? 1);
      await deliverWebhook(job.data.labId, job.data.deliveryId, { allowPrivate: o.allowPrivate, final });
    },
    { connection: o.connection.duplicate({ maxRetriesPerRequest: null }), prefix: o.prefix, concurrency: 4 },
  );
  worker.on('error', () => undefined);
  const sweep = async (): Promise<number> => {
    const pending = await listPendingDeliveries();
    for (const d of pending) {
      await queue.add('deliver', { deliveryId: d.id, labId: d.labId }, {
        jobId: `webhook-${d.id}`,
        attempts: o.attempts ?? WEBHOOK_ATTEMPTS,
        backoff: { type: 'exponential', delay: o.backoffMs ?? 2000 },
        removeOnComplete: true,
        removeOnFail: true,
      });
    }
    return pending.length;
  };
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    sweep()
      .catch((e) => console.error('[worker] webhook sweep failed:', e instanceof Error ? e.message : e))
      .finally(() => (running = false));
  }, o.sweepMs ?? 2000);
  timer.unref();
  return {
    sweep,
    close: async () => {
      clearInterval(timer);
      await worker.close();
      await queue.close();
    },
  };
}
