import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import { createAnalysis, type Analysis } from '../../db/queries/analyses';
import { getEnv } from '../env';
import { producerConnection } from './connection';
import { addAnalysisJob } from './jobs';
import { ANALYSIS_QUEUE } from './names';

const g = globalThis as unknown as { __veilmeterAnalysisQueue?: Queue };

/** A queue handle on a given connection, under the configured key prefix. */
export function createAnalysisQueue(connection: Redis, prefix = getEnv().QUEUE_PREFIX): Queue {
  const queue = new Queue(ANALYSIS_QUEUE, { connection, prefix });
  // connection errors surface as a false from tryEnqueue and in the health check, not as log noise
  queue.on('error', () => undefined);
  return queue;
}

/** The web app's queue handle, on the fail-fast producer connection. */
export function getAnalysisQueue(): Queue {
  g.__veilmeterAnalysisQueue ??= createAnalysisQueue(producerConnection());
  return g.__veilmeterAnalysisQueue;
}

/** How long a request may wait on Redis before it answers without it. */
export const ENQUEUE_TIMEOUT_MS = 1500;

/**
 * Tries to put the analysis on the queue without making the request wait on a Redis that is down:
 * false means it stays queued in the table and the worker's sweeper enqueues it later.
 */
export async function tryEnqueue(queue: Queue, analysisId: string, labId: string, timeoutMs = ENQUEUE_TIMEOUT_MS): Promise<boolean> {
  const client = (queue.opts.connection as Redis | undefined) ?? null;
  if (client && typeof client.status === 'string' && client.status !== 'ready') return false;
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      addAnalysisJob(queue, { analysisId, labId }),
      new Promise<never>((_, reject) => {
        timer = setTimeout(() => reject(new Error('enqueue timed out')), timeoutMs);
      }),
    ]);
    return true;
  } catch (e) {
    console.warn(`[queue] analysis ${analysisId} stays queued in the table: ${e instanceof Error ? e.message : String(e)}`);
    return false;
  } finally {
    if (timer) clearTimeout(timer);
  }
}

/** Records the analysis first, then queues it; the row alone is enough for the sweeper to finish the job. */
export async function requestAnalysis(
  labId: string,
  userId: string | null,
  captureSetId: string,
  queue: Queue = getAnalysisQueue(),
): Promise<{ analysis: Analysis; enqueued: boolean }> {
  const analysis = await createAnalysis(labId, userId, captureSetId);
  const enqueued = await tryEnqueue(queue, analysis.id, labId);
  return { analysis, enqueued };
}
