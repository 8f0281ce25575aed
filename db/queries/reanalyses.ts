import { getDb } from '../index';
import { recordAudit } from './audit';

/** Dotted version numbers compared part by part; anything else sorts before every version (it is not current). */
export function compareVersions(a: string, b: string): number {
  const parse = (v: string): number[] | null => (/^\d+(\.\d+)*$/.test(v) ? v.split('.').map(Number) : null);
  const x = parse(a);
  const y = parse(b);
  if (!x || !y) return x ? 1 : y ? -1 : 0;
  for (let k = 0; k < Math.max(x.length, y.length); k++) {
    const d = (x[k] ?? 0) - (y[k] ?? 0);
    if (d !== 0) return Math.sign(d);
  }
  return 0;
}

export type OutdatedSet = { captureSetId: string; label: string; revisionId: string; revisionLabel: string; engineVersion: string };

/**
 * Capture sets of the project (or of one revision) whose newest reading was made by an engine older
 * than `current`, in the order they were made. Another lab's project gives none.
 */
export async function listOutdatedSets(labId: string, scope: { projectId: string; revisionId?: string | null }, current: string): Promise<OutdatedSet[]> {
  const q = getDb()('capture_sets as c')
    .join('revisions as r', 'r.id', 'c.revision_id')
    .joinRaw('JOIN LATERAL (SELECT g.engine_version FROM readings g WHERE g.capture_set_id = c.id AND g.lab_id = c.lab_id ORDER BY g.created_at DESC LIMIT 1) lr ON true')
    .where({ 'c.lab_id': labId, 'r.lab_id': labId, 'r.project_id': scope.projectId })
    .andWhereNot('lr.engine_version', current)
    .orderBy([{ column: 'r.position' }, { column: 'c.created_at' }])
    .select('c.id', 'c.label', 'c.revision_id', 'r.label as revision_label', 'lr.engine_version');
  if (scope.revisionId) q.andWhere('c.revision_id', scope.revisionId);
  const rows: { id: string; label: string; revision_id: string; revision_label: string; engine_version: string }[] = await q;
  return rows
    .filter((r) => compareVersions(r.engine_version, current) < 0)
    .map((r) => ({ captureSetId: r.id, label: r.label, revisionId: r.revision_id, revisionLabel: r.revision_label, engineVersion: r.engine_version }));
}

/** Records a batch and its capture sets (not yet queued). */
export async function createReanalysisBatch(labId: string, userId: string, scope: { projectId: string; revisionId: string | null }, engineVersion: string, captureSetIds: readonly string[]): Promise<string> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('reanalysis_batches')
      .insert({ lab_id: labId, project_id: scope.projectId, revision_id: scope.revisionId, engine_version: engineVersion, requested_by: userId })
      .returning<{ id: string }[]>('id');
    if (!row) throw new Error('insert returned nothing');
    if (captureSetIds.length) await trx('reanalysis_items').insert(captureSetIds.map((id) => ({ batch_id: row.id, lab_id: labId, capture_set_id: id })));
    await recordAudit({ labId, userId, action: 'analysis.reanalyse', targetType: scope.revisionId ? 'revision' : 'project', targetId: scope.revisionId ?? scope.projectId, details: { batchId: row.id, engineVersion, captureSets: captureSetIds.length } }, trx);
    return row.id;
  });
}

/** Ties a batch's capture set to the analysis queued (or found in flight) for it. */
export async function attachBatchAnalyses(labId: string, batchId: string, pairs: readonly { captureSetId: string; analysisId: string }[]): Promise<void> {
  for (const p of pairs) {
    await getDb()('reanalysis_items').where({ lab_id: labId, batch_id: batchId, capture_set_id: p.captureSetId }).update({ analysis_id: p.analysisId });
  }
}

export type BatchProgress = {
  id: string;
  projectId: string;
  revisionId: string | null;
  engineVersion: string;
  createdAt: Date;
  total: number;
  done: number;
  failed: number;
  /** Queued or running on the worker. */
  inFlight: number;
  /** Not queued yet: the lab's queue was full when they were asked for. */
  waiting: number;
  waitingSetIds: string[];
  failures: { captureSetId: string; label: string; error: string }[];
  finished: boolean;
};

/** What a page or a handler shows of a batch: its counts, without the internal list of waiting sets. */
export type BatchView = Omit<BatchProgress, 'waitingSetIds'>;
export const batchView = ({ waitingSetIds: _w, ...rest }: BatchProgress): BatchView => rest;

/** A batch of the lab with its progress; null for an unknown batch or another lab's. */
export async function getBatchProgress(labId: string, batchId: string): Promise<BatchProgress | null> {
  const db = getDb();
  const batch = await db('reanalysis_batches').where({ lab_id: labId, id: batchId }).first<{ id: string; project_id: string; revision_id: string | null; engine_version: string; created_at: Date } | undefined>();
  if (!batch) return null;
  const items: { capture_set_id: string; label: string; analysis_id: string | null; status: string | null; error: string | null }[] = await db('reanalysis_items as i')
    .join('capture_sets as c', 'c.id', 'i.capture_set_id')
    .leftJoin('analyses as a', function join() {
      this.on('a.id', '=', 'i.analysis_id').andOn('a.lab_id', '=', 'i.lab_id');
    })
    .where({ 'i.lab_id': labId, 'i.batch_id': batchId })
    .orderBy('c.created_at')
    .select('i.capture_set_id', 'c.label', 'i.analysis_id', 'a.status', 'a.error');
  const count = (f: (i: (typeof items)[number]) => boolean) => items.filter(f).length;
  const done = count((i) => i.status === 'done');
  const failed = count((i) => i.status === 'failed');
  const waitingSetIds = items.filter((i) => i.analysis_id === null).map((i) => i.capture_set_id);
  return {
    id: batch.id,
    projectId: batch.project_id,
    revisionId: batch.revision_id,
    engineVersion: batch.engine_version,
    createdAt: batch.created_at,
    total: items.length,
    done,
    failed,
    inFlight: count((i) => i.status === 'queued' || i.status === 'running'),
    waiting: waitingSetIds.length,
    waitingSetIds,
    failures: items.filter((i) => i.status === 'failed').map((i) => ({ captureSetId: i.capture_set_id, label: i.label, error: i.error ?? 'failed' })),
    finished: done + failed === items.length,
  };
}

/**
 * Batches of every lab with capture sets not queued yet (the lab's queue was full when they were
 * asked for), oldest first: the worker's sweeper asks for them again as room frees.
 */
export async function listBatchesWithWaiting(limit = 50): Promise<{ labId: string; batchId: string; requestedBy: string | null }[]> {
  const rows: { lab_id: string; id: string; requested_by: string | null }[] = await getDb()('reanalysis_batches as b')
    .whereExists(function waiting() {
      this.select(getDb().raw('1')).from('reanalysis_items as i').whereRaw('i.batch_id = b.id AND i.lab_id = b.lab_id').whereNull('i.analysis_id');
    })
    .orderBy('b.created_at')
    .limit(limit)
    .select('b.lab_id', 'b.id', 'b.requested_by');
  return rows.map((r) => ({ labId: r.lab_id, batchId: r.id, requestedBy: r.requested_by }));
}

/**
 * The newest batch over this revision (or the whole project) still running, or finished within
 * `recentMinutes`, so its page keeps showing how it ended; null when there is none.
 */
export async function findRecentBatch(labId: string, projectId: string, revisionId: string | null, recentMinutes = 15): Promise<BatchProgress | null> {
  const q = getDb()('reanalysis_batches').where({ lab_id: labId, project_id: projectId }).orderBy('created_at', 'desc').limit(5).select<{ id: string; created_at: Date }[]>('id', 'created_at');
  if (revisionId) q.andWhere((w) => w.where('revision_id', revisionId).orWhereNull('revision_id'));
  else q.whereNull('revision_id');
  const since = Date.now() - recentMinutes * 60_000;
  for (const row of await q) {
    const p = await getBatchProgress(labId, row.id);
    if (p && (!p.finished || row.created_at.getTime() >= since)) return p;
  }
  return null;
}
