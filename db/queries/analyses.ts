import type { Knex } from 'knex';
import { getDb } from '../index';
import { recordAudit } from './audit';

export type AnalysisStatus = 'queued' | 'running' | 'done' | 'failed';

export type Analysis = {
  id: string;
  labId: string;
  captureSetId: string;
  status: AnalysisStatus;
  engineVersion: string | null;
  attempts: number;
  progress: number;
  stage: string;
  error: string | null;
  queuedAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
  requestedBy: string | null;
};

type Row = { id: string; lab_id: string; capture_set_id: string; status: AnalysisStatus; engine_version: string | null; attempts: number; progress: number; stage: string; error: string | null; queued_at: Date; started_at: Date | null; finished_at: Date | null; requested_by: string | null };

export const toAnalysis = (r: Row): Analysis => ({
  id: r.id,
  labId: r.lab_id,
  captureSetId: r.capture_set_id,
  status: r.status,
  engineVersion: r.engine_version,
  attempts: r.attempts,
  progress: r.progress,
  stage: r.stage,
  error: r.error,
  queuedAt: r.queued_at,
  startedAt: r.started_at,
  finishedAt: r.finished_at,
  requestedBy: r.requested_by,
});

/** The row is written before the job is queued, so a lost queue can be rebuilt from the table. */
export async function createAnalysis(labId: string, userId: string | null, captureSetId: string): Promise<Analysis> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('analyses').insert({ lab_id: labId, capture_set_id: captureSetId, requested_by: userId, status: 'queued', stage: 'queued' }).returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'analysis.request', targetType: 'analysis', targetId: row.id, details: { captureSetId } }, trx);
    return toAnalysis(row);
  });
}

export async function getAnalysis(labId: string, id: string): Promise<Analysis | null> {
  const row: Row | undefined = await getDb()('analyses').where({ lab_id: labId, id }).first();
  return row ? toAnalysis(row) : null;
}

export type AnalysisWithReading = Analysis & { readingId: string | null; ambientContrastRatio: number | null; warningCount: number | null };

/** A capture set's analyses, newest first: the history of re-runs. */
export async function listAnalyses(labId: string, captureSetId: string): Promise<AnalysisWithReading[]> {
  const rows = await getDb()('analyses as a')
    .leftJoin('readings as g', 'g.analysis_id', 'a.id')
    .where({ 'a.lab_id': labId, 'a.capture_set_id': captureSetId })
    .orderBy('a.created_at', 'desc')
    .select('a.*', 'g.id as reading_id', 'g.ambient_contrast_ratio', 'g.warning_count');
  return rows.map((r: Row & { reading_id: string | null; ambient_contrast_ratio: number | null; warning_count: number | null }) => ({
    ...toAnalysis(r),
    readingId: r.reading_id,
    ambientContrastRatio: r.ambient_contrast_ratio,
    warningCount: r.warning_count,
  }));
}

// The functions below are the worker's: it acts for whichever lab queued the job, so they take the
// lab id from the job and still keep it in the where.

/** Claims the analysis for a run; null when it is already finished (a redelivered job does nothing). */
export async function startAnalysisRun(labId: string, id: string): Promise<Analysis | null> {
  const [row] = await getDb()('analyses')
    .where({ lab_id: labId, id })
    .whereIn('status', ['queued', 'running'])
    .update({ status: 'running', attempts: getDb().raw('attempts + 1'), progress: 2, stage: 'loading', error: null, started_at: getDb().fn.now(), updated_at: getDb().fn.now() })
    .returning<Row[]>('*');
  return row ? toAnalysis(row) : null;
}

export async function setAnalysisProgress(labId: string, id: string, stage: string, progress: number): Promise<void> {
  await getDb()('analyses')
    .where({ lab_id: labId, id, status: 'running' })
    .update({ stage, progress: Math.max(0, Math.min(99, Math.round(progress))), updated_at: getDb().fn.now() });
}

export async function markAnalysisDone(labId: string, id: string, engineVersion: string, trx: Knex | Knex.Transaction = getDb()): Promise<void> {
  await trx('analyses').where({ lab_id: labId, id }).update({ status: 'done', stage: 'done', progress: 100, engine_version: engineVersion, error: null, finished_at: trx.fn.now(), updated_at: trx.fn.now() });
}

export async function markAnalysisFailed(labId: string, id: string, message: string): Promise<void> {
  await getDb()('analyses').where({ lab_id: labId, id }).whereNot('status', 'done').update({ status: 'failed', stage: 'failed', error: message, finished_at: getDb().fn.now(), updated_at: getDb().fn.now() });
}

/** Back to the queue after a transient failure: the next attempt starts it again. */
export async function markAnalysisRetrying(labId: string, id: string, message: string): Promise<void> {
  await getDb()('analyses').where({ lab_id: labId, id, status: 'running' }).update({ status: 'queued', stage: 'retrying', error: message, updated_at: getDb().fn.now() });
}

/** A queued analysis whose job the queue gave up on: the row catches up and says to run it again. */
export async function failAbandonedAnalysis(labId: string, id: string): Promise<void> {
  await getDb()('analyses').where({ lab_id: labId, id }).whereIn('status', ['queued']).update({ status: 'failed', stage: 'failed', error: 'The analysis could not be completed. Run it again.', finished_at: getDb().fn.now() });
}

/** A running analysis whose job is gone (Redis lost it): back to queued, to be enqueued again. */
export async function requeueLostAnalysis(labId: string, id: string): Promise<void> {
  await getDb()('analyses').where({ lab_id: labId, id, status: 'running' }).update({ status: 'queued', stage: 'queued', updated_at: getDb().fn.now() });
}

/**
 * Analyses that should be on the queue: queued (or running without progress for a while) and older
 * than a grace period, so the web app's own enqueue right after the insert is not raced.
 */
export async function listUnfinishedAnalyses(olderThanSeconds: number, limit = 500): Promise<{ id: string; labId: string; status: AnalysisStatus }[]> {
  const rows = await getDb()('analyses')
    .whereIn('status', ['queued', 'running'])
    .andWhere('updated_at', '<', getDb().raw(`now() - make_interval(secs => ?)`, [olderThanSeconds]))
    .orderBy('queued_at')
    .limit(limit)
    .select('id', 'lab_id', 'status');
  return rows.map((r: { id: string; lab_id: string; status: AnalysisStatus }) => ({ id: r.id, labId: r.lab_id, status: r.status }));
}
