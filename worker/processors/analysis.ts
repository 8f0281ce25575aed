// The sandboxed processor: BullMQ runs it in a worker thread, so the engine's pixel loops never
// block the main thread that renews job locks and talks to Redis.
import { UnrecoverableError, type SandboxedJob } from 'bullmq';
import { markAnalysisFailed, markAnalysisRetrying } from '../../db/queries/analyses';
import { isEngineInputError } from '../../lib/photometry/errors';
import { analysisJobSchema } from '../../lib/server/queue/names';
import { isStorageUnavailable } from '../../lib/server/storage/s3';
import { runAnalysis, testerMessage, type RunOutcome } from './run-analysis';

export const INTERNAL_FAILURE = 'The analysis stopped on an internal error after several tries. Run it again; if it fails again, tell your lab admin.';

export default async function processAnalysis(job: SandboxedJob): Promise<RunOutcome> {
  const parsed = analysisJobSchema.safeParse(job.data);
  if (!parsed.success) throw new UnrecoverableError('job data is not an analysis job');
  const { analysisId, labId } = parsed.data;
  try {
    return await runAnalysis(labId, analysisId, (p) => void job.updateProgress(Math.round(p)));
  } catch (e) {
    if (isEngineInputError(e)) {
      await markAnalysisFailed(labId, analysisId, testerMessage(e.message));
      throw new UnrecoverableError(e.message);
    }
    const last = job.attemptsMade + 1 >= (job.opts.attempts ?? 1);
    const detail = e instanceof Error ? e.message : String(e);
    console.error(`[worker] analysis ${analysisId} attempt ${job.attemptsMade + 1} failed: ${detail}`);
    // an unreachable object store is the operator's to fix, so the tester is told which part is away
    const storeDown = isStorageUnavailable(e);
    const failure = storeDown ? `The photo store could not be reached, so the analysis stopped after ${job.attemptsMade + 1} tries. Run it again once the store is back; if it stays away, tell your lab admin.` : INTERNAL_FAILURE;
    const retrying = storeDown ? 'The photo store did not answer; the analysis will be retried.' : 'A transient problem interrupted the analysis; it will be retried.';
    await (last ? markAnalysisFailed(labId, analysisId, failure) : markAnalysisRetrying(labId, analysisId, retrying)).catch(() => undefined);
    throw e;
  }
}
