import type { JobsOptions, Queue } from 'bullmq';
import { analysisJobId, analysisJobSchema, type AnalysisJob } from './names';

/** Three tries, 2 s then 4 s apart: enough to ride out a database restart, not to hide a bug. */
export const ANALYSIS_JOB_OPTIONS: JobsOptions = {
  attempts: 3,
  backoff: { type: 'exponential', delay: 2000 },
  removeOnComplete: { count: 1000, age: 7 * 24 * 3600 },
  removeOnFail: { count: 5000, age: 30 * 24 * 3600 },
};

/** BullMQ's largest priority (lower runs sooner). */
export const MAX_PRIORITY = 2_097_152;

/**
 * The queue priority of a lab's `rank`-th waiting analysis: its rank itself. Every lab's next
 * analysis has priority 1, its second 2, and so on, and BullMQ runs lower numbers first (first in,
 * first out among equals), so labs take turns: a lab that queued twenty does not hold back another
 * lab's one. Ranks are bounded by the per-lab limit (db/queries/analysis-requests.ts).
 */
export function fairPriority(rank: number): number {
  return Math.min(MAX_PRIORITY, Math.max(1, Math.floor(rank)));
}

/**
 * Adds the job for an analysis; the fixed job id makes a second add of the same analysis a no-op.
 * Every job carries a priority (1 when not given): BullMQ runs jobs without one before all
 * prioritised ones, which would let them jump every lab's turn.
 */
export async function addAnalysisJob(queue: Queue, data: AnalysisJob, priority = 1): Promise<void> {
  const job = analysisJobSchema.parse(data);
  await queue.add('analyse', job, { ...ANALYSIS_JOB_OPTIONS, jobId: analysisJobId(job.analysisId), priority: fairPriority(priority) });
}

/** Stages the worker reports, in order, with the share of the work done when each begins. */
export const ANALYSIS_STAGES: { stage: string; label: string }[] = [
  { stage: 'queued', label: 'Waiting for a worker' },
  { stage: 'retrying', label: 'Waiting to retry after a hiccup' },
  { stage: 'loading', label: 'Reading the photos' },
  { stage: 'read', label: 'Reading the photos' },
  { stage: 'decode', label: 'Decoding and linearising' },
  { stage: 'analyse', label: 'Measuring' },
  { stage: 'registration', label: 'Aligning the photos' },
  { stage: 'regions', label: 'Finding the screen' },
  { stage: 'ghost', label: 'Looking for ghosts' },
  { stage: 'measure', label: 'Measuring luminance' },
  { stage: 'crops', label: 'Measuring luminance' },
  { stage: 'ghost-ratio', label: 'Measuring the ghost' },
  { stage: 'see-through', label: 'Measuring transmission and tint' },
  { stage: 'clipping', label: 'Checking for clipping' },
  { stage: 'maps', label: 'Drawing the maps' },
  { stage: 'artifacts', label: 'Storing the maps' },
  { stage: 'saving', label: 'Saving the reading' },
  { stage: 'done', label: 'Done' },
  { stage: 'failed', label: 'Failed' },
];

export function stageLabel(stage: string): string {
  return ANALYSIS_STAGES.find((s) => s.stage === stage)?.label ?? 'Measuring';
}
