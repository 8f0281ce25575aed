import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import type { Analysis } from '../../../db/queries/analyses';
import { LAB_ANALYSIS_LIMIT, recordAnalysisRequests, typicalRunSeconds } from '../../../db/queries/analysis-requests';
import { TooBusy } from '../../errors';
import { getEnv } from '../../env';
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
export async function tryEnqueue(queue: Queue, analysisId: string, labId: string, timeoutMs = ENQUEUE_TIMEOUT_MS, priority = 1): Promise<boolean> {
  const client = (queue.opts.connection as Redis | undefined) ?? null;
  if (client && typeof client.status === 'string' && client.status !== 'ready') return false;
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      addAnalysisJob(queue, { analysisId, labId }, priority),
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

export type AnalysisRequested = {
  analysis: Analysis;
  /** false: the row is saved but Redis was away; the worker's sweeper queues it later */
  enqueued: boolean;
  /** true: the set's analysis was already waiting or running, and this is that one */
  coalesced: boolean;
};

function labFull(retryAfterS: number): TooBusy {
  return new TooBusy(
    `Your lab already has ${LAB_ANALYSIS_LIMIT} analyses waiting or running, the most it may queue at once. Try again when some have finished (about ${retryAfterS} s).`,
    retryAfterS,
    'lab_queue_full',
  );
}

/**
 * Records the analysis first, then queues it; the row alone is enough for the sweeper to finish the
 * job. A set whose analysis is already waiting or running gets that analysis back (fifty clicks make
 * one job). Beyond LAB_ANALYSIS_LIMIT analyses in flight for the lab it throws TooBusy (429 with
 * Retry-After). New jobs are queued at their lab's fair priority (lib/server/queue/jobs.ts fairPriority).
 */
export async function requestAnalysis(labId: string, userId: string | null, captureSetId: string, queue: Queue = getAnalysisQueue()): Promise<AnalysisRequested> {
  const [one] = await requestAnalyses(labId, userId, [captureSetId], queue);
  if (!one) throw new Error('no outcome for the capture set');
  if (one.kind === 'refused') throw labFull(one.retryAfterS);
  return { analysis: one.analysis, enqueued: one.enqueued, coalesced: one.kind === 'coalesced' };
}

export type BulkOutcome =
  | ({ kind: 'created' | 'coalesced'; captureSetId: string } & Omit<AnalysisRequested, 'coalesced'>)
  | { kind: 'refused'; captureSetId: string; retryAfterS: number };

/**
 * The same for many capture sets of one lab at once (a whole revision re-analysed): one transaction,
 * each set coalesced with its analysis in flight or recorded while the lab is under its limit, the
 * rest refused with a Retry-After estimate (the caller says so, or asks again later). The new jobs
 * take the lab's next ranks, so other labs' analyses still interleave with them. Outcomes follow
 * the order of `captureSetIds`.
 */
export async function requestAnalyses(labId: string, userId: string | null, captureSetIds: readonly string[], queue: Queue = getAnalysisQueue()): Promise<BulkOutcome[]> {
  const outcomes = await recordAnalysisRequests(labId, userId, captureSetIds);
  const retryAfterS = outcomes.some((o) => o.kind === 'refused') ? await typicalRunSeconds(labId) : 0;
  const out: BulkOutcome[] = [];
  for (const o of outcomes) {
    if (o.kind === 'refused') out.push({ kind: 'refused', captureSetId: o.captureSetId, retryAfterS });
    else if (o.kind === 'created') {
      out.push({ kind: 'created', captureSetId: o.captureSetId, analysis: o.analysis, enqueued: await tryEnqueue(queue, o.analysis.id, labId, ENQUEUE_TIMEOUT_MS, o.rank) });
    } else {
      // a waiting one is put back if Redis lost it (the fixed job id makes this a no-op otherwise)
      const enqueued = o.analysis.status === 'queued' ? await tryEnqueue(queue, o.analysis.id, labId, ENQUEUE_TIMEOUT_MS, 1) : true;
      out.push({ kind: 'coalesced', captureSetId: o.captureSetId, analysis: o.analysis, enqueued });
    }
  }
  return out;
}
