import type { Queue } from 'bullmq';
import { failAbandonedAnalysis, listUnfinishedAnalyses, requeueLostAnalysis } from '../db/queries/analyses';
import { waitingRank } from '../db/queries/analysis-requests';
import { addAnalysisJob } from '../lib/server/queue/jobs';
import { analysisJobId } from '../lib/server/queue/names';
import { queueWaitingBatches } from '../lib/server/queue/reanalysis';

/**
 * Puts back on the queue every unfinished analysis whose job Redis does not have (Redis restarted
 * without its data, or the web app could not reach it). The table is the truth; the queue is rebuilt
 * from it. Returns how many were re-enqueued.
 */
export async function sweepAnalyses(queue: Queue, graceSeconds: number): Promise<number> {
  const candidates = await listUnfinishedAnalyses(graceSeconds);
  let restored = 0;
  for (const a of candidates) {
    const job = await queue.getJob(analysisJobId(a.id));
    if (job) {
      const state = await job.getState();
      // a job BullMQ gave up on while the row still says queued: the row catches up
      if (state === 'failed' && a.status !== 'running') {
        await failAbandonedAnalysis(a.labId, a.id);
      }
      continue;
    }
    if (a.status === 'running') {
      await requeueLostAnalysis(a.labId, a.id);
    }
    // back at its lab's turn (lib/server/queue/jobs.ts fairPriority), not ahead of every lab
    await addAnalysisJob(queue, { analysisId: a.id, labId: a.labId }, await waitingRank(a.labId, a.id));
    restored++;
  }
  return restored;
}

/** Re-analysis batches whose sets the lab's queue could not take yet: asked for again as room frees. */
export async function sweepReanalyses(queue: Queue): Promise<number> {
  return queueWaitingBatches(queue);
}
