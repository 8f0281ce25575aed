import type { Queue } from 'bullmq';
import { attachBatchAnalyses, getBatchProgress, listBatchesWithWaiting, type BatchProgress } from '../../../db/queries/reanalyses';
import { requestAnalyses } from './producer';

/**
 * Queues through the producer the batch's capture sets that are not queued yet. The lab's limit of
 * analyses in flight may refuse some: they stay waiting, and the worker's sweeper asks for them
 * again as room frees (queueWaitingBatches).
 */
export async function queueWaiting(labId: string, userId: string | null, batch: BatchProgress, queue?: Queue): Promise<BatchProgress> {
  if (batch.waitingSetIds.length === 0) return batch;
  const outcomes = await requestAnalyses(labId, userId, batch.waitingSetIds, queue);
  const queued = outcomes.flatMap((o) => (o.kind === 'refused' ? [] : [{ captureSetId: o.captureSetId, analysisId: o.analysis.id }]));
  if (queued.length === 0) return batch;
  await attachBatchAnalyses(labId, batch.id, queued);
  return (await getBatchProgress(labId, batch.id)) ?? batch;
}

/**
 * For the worker: asks again for every batch's waiting capture sets, on behalf of whoever started
 * the batch. Returns how many were queued.
 */
export async function queueWaitingBatches(queue: Queue): Promise<number> {
  let queued = 0;
  for (const b of await listBatchesWithWaiting()) {
    const before = await getBatchProgress(b.labId, b.batchId);
    if (!before) continue;
    const after = await queueWaiting(b.labId, b.requestedBy, before, queue);
    queued += before.waiting - after.waiting;
  }
  return queued;
}
