// The worker process: consumes the analysis queue. Run one or more: `npm run worker`.
// Options (for tests and tuning): --sweep-every=SECONDS (default 15), --sweep-grace=SECONDS (default 10).
import { fileURLToPath } from 'node:url';
import { Queue, Worker } from 'bullmq';
import { closeDatabase, pingDatabase } from '../db/queries/connection';
import { getEnv } from '../lib/env';
import { workerConnection } from '../lib/server/queue/connection';
import { ANALYSIS_QUEUE } from '../lib/server/queue/names';
import { sweepAnalyses, sweepReanalyses } from './sweeper';
import { startWebhookDelivery, webhooksMayReachPrivate } from '../lib/server/webhooks/runner';

function numberArg(name: string, fallback: number): number {
  const arg = process.argv.find((a) => a.startsWith(`--${name}=`));
  const v = arg ? Number(arg.slice(name.length + 3)) : NaN;
  return Number.isFinite(v) && v >= 0 ? v : fallback;
}

// the processor is a separate module so BullMQ can load it in a worker thread
const processorFile = fileURLToPath(new URL('./processors/analysis-entry.mjs', import.meta.url));

async function main(): Promise<void> {
  const env = getEnv();
  const sweepEvery = numberArg('sweep-every', 15);
  const sweepGrace = numberArg('sweep-grace', 10);
  await pingDatabase();

  const workerRedis = workerConnection();
  const queueRedis = workerConnection();
  await workerRedis.ping();
  const queue = new Queue(ANALYSIS_QUEUE, { connection: queueRedis, prefix: env.QUEUE_PREFIX });
  const worker = new Worker(ANALYSIS_QUEUE, processorFile, {
    connection: workerRedis,
    prefix: env.QUEUE_PREFIX,
    concurrency: env.WORKER_CONCURRENCY,
    useWorkerThreads: true,
    // short locks: a worker killed mid-job hands its job on within seconds, not half a minute
    lockDuration: 10_000,
    stalledInterval: 5_000,
    maxStalledCount: 2,
  });
  worker.on('failed', (job, err) => {
    if (job) console.log(`[worker ${process.pid}] ${job.id} failed (attempt ${job.attemptsMade}): ${err.message}`);
  });
  worker.on('completed', (job) => console.log(`[worker ${process.pid}] ${job.id} done`));
  worker.on('error', (err) => console.error(`[worker ${process.pid}] ${err.message}`));

  let sweeping = false;
  const sweep = async () => {
    if (sweeping) return;
    sweeping = true;
    try {
      const n = await sweepAnalyses(queue, sweepGrace);
      if (n > 0) console.log(`[worker ${process.pid}] sweeper re-enqueued ${n} analyses`);
      const m = await sweepReanalyses(queue);
      if (m > 0) console.log(`[worker ${process.pid}] sweeper queued ${m} waiting re-analyses`);
    } catch (e) {
      // Redis or the database is away; the next sweep tries again
      console.warn(`[worker ${process.pid}] sweep skipped: ${e instanceof Error ? e.message : String(e)}`);
    } finally {
      sweeping = false;
    }
  };
  const timer = setInterval(() => void sweep(), Math.max(0.2, sweepEvery) * 1000);
  // a finished job frees room in its lab's queue: waiting re-analyses go on without the next tick
  worker.on('completed', () => void sweep());
  const webhooks = startWebhookDelivery({ connection: queueRedis, prefix: env.QUEUE_PREFIX, allowPrivate: webhooksMayReachPrivate(env) });
  void sweep();
  console.log(`[worker ${process.pid}] ready (queue ${env.QUEUE_PREFIX}:${ANALYSIS_QUEUE}, concurrency ${env.WORKER_CONCURRENCY})`);

  let closing = false;
  const shutdown = async (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`[worker ${process.pid}] ${signal}: closing`);
    clearInterval(timer);
    // the order matters: finish or hand back the jobs, then drop Redis, then the pool
    await worker.close().catch(() => undefined);
    await webhooks.close().catch(() => undefined);
    await queue.close().catch(() => undefined);
    workerRedis.disconnect();
    queueRedis.disconnect();
    await closeDatabase();
    process.exit(0);
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));
}

main().catch((err: unknown) => {
  console.error(`[worker] could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
