// The worker process: consumes the analysis queue. Run one or more: `npm run worker`.
import { closeDb, getDb } from '../db/index';
import { workerConnection } from '../lib/queue/connection';

async function main(): Promise<void> {
  const redis = workerConnection();
  await getDb().raw('select 1');
  await redis.ping();
  console.log(`[worker ${process.pid}] ready`);

  let closing = false;
  const shutdown = async (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`[worker ${process.pid}] ${signal}: closing`);
    redis.disconnect();
    await closeDb();
    process.exit(0);
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));
}

main().catch((err: unknown) => {
  console.error(`[worker] could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
