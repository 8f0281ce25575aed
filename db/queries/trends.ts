import { getDb } from '../index';
import type { UncertainMetric } from '../../lib/photometry/result';
import { METRIC_LIST, type MetricKey } from '../../lib/targets/metrics';
import { buildTrends, type RevisionRef, type SetReading, type Trend } from '../../lib/targets/series';

const METRIC_COLUMNS = METRIC_LIST.map((m) => `g.${m.column}`);

type Row = { id: string; capture_set_id: string; capture_label: string; revision_id: string; variant: string; created_at: Date; pattern?: string; uncertainty?: Partial<Record<string, number>> | null; conditions?: { ambientLux?: unknown; backgroundCdm2?: unknown } | null; background_cdm2?: unknown } & Record<string, unknown>;

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

export function toSetReading(r: Row): SetReading {
  const values = {} as Record<MetricKey, number | null>;
  for (const m of METRIC_LIST) values[m.key] = num(r[m.column]);
  const out: SetReading = { readingId: r.id, captureSetId: r.capture_set_id, captureLabel: r.capture_label, revisionId: r.revision_id, variant: r.variant, createdAt: r.created_at, values };
  if (r.uncertainty && Object.keys(r.uncertainty).length > 0) out.uncertainty = r.uncertainty;
  if (r.pattern !== undefined) {
    out.conditions = {
      pattern: r.pattern === 'checkerboard' ? 'checkerboard' : 'full',
      ambientLux: num(r.conditions?.ambientLux),
      // the capture set's current statement first (it may have been corrected since the analysis)
      backgroundCdm2: num(r.conditions?.backgroundCdm2) ?? num(r.background_cdm2),
    };
  }
  return out;
}

/**
 * The newest reading of each capture set of a project (re-runs keep their history; only the
 * latest counts), optionally of one revision and one variant. The variant is the capture set's
 * current label, so a renamed variant moves its captures with it.
 */
export async function listNewestReadings(labId: string, filter: { projectId?: string; revisionId?: string; variant?: string | null }): Promise<SetReading[]> {
  const db = getDb();
  const q = db
    .select(db.raw('DISTINCT ON (g.capture_set_id) g.id'), 'g.capture_set_id', 'c.label as capture_label', 'g.revision_id', 'c.variant', 'c.pattern', 'c.conditions', 'g.background_cdm2', 'g.created_at', 'g.uncertainty', ...METRIC_COLUMNS)
    .from('readings as g')
    .join('capture_sets as c', 'c.id', 'g.capture_set_id')
    .where('g.lab_id', labId);
  if (filter.projectId) q.andWhere('g.project_id', filter.projectId);
  if (filter.revisionId) q.andWhere('g.revision_id', filter.revisionId);
  if (filter.variant !== undefined && filter.variant !== null) q.andWhere('c.variant', filter.variant);
  const rows: Row[] = await q.orderBy([{ column: 'g.capture_set_id' }, { column: 'g.created_at', order: 'desc' }]);
  return rows.map(toSetReading).sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.captureLabel.localeCompare(b.captureLabel));
}

export type ReadingsPage = { readings: (SetReading & { revisionLabel: string; uncertainty: Partial<Record<UncertainMetric, number>> })[]; total: number };

/**
 * One page of a project's readings list: the newest reading of each capture set, newest first
 * (ties by reading id, so pages never overlap), with the number of capture sets that have one.
 */
export async function listNewestReadingsPage(labId: string, projectId: string, page: { limit: number; offset: number }): Promise<ReadingsPage> {
  const db = getDb();
  const newest = db
    .select(db.raw('DISTINCT ON (g.capture_set_id) g.id'), 'g.capture_set_id', 'c.label as capture_label', 'g.revision_id', 'r.label as revision_label', 'c.variant', 'g.created_at', 'g.uncertainty', ...METRIC_COLUMNS)
    .from('readings as g')
    .join('capture_sets as c', 'c.id', 'g.capture_set_id')
    .join('revisions as r', 'r.id', 'g.revision_id')
    .where({ 'g.lab_id': labId, 'g.project_id': projectId })
    .orderBy([{ column: 'g.capture_set_id' }, { column: 'g.created_at', order: 'desc' }, { column: 'g.id', order: 'desc' }]);
  const [rows, count] = await Promise.all([
    db.select('*').from(newest.as('n')).orderBy([{ column: 'created_at', order: 'desc' }, { column: 'id', order: 'desc' }]).limit(page.limit).offset(page.offset) as Promise<(Row & { revision_label: string; uncertainty: Partial<Record<UncertainMetric, number>> | null })[]>,
    db('readings').where({ lab_id: labId, project_id: projectId }).countDistinct<{ n: string }[]>('capture_set_id as n').first(),
  ]);
  return { readings: rows.map((r) => ({ ...toSetReading(r), revisionLabel: r.revision_label, uncertainty: r.uncertainty ?? {} })), total: Number(count?.n ?? 0) };
}

export async function listRevisionRefs(labId: string, projectId: string): Promise<RevisionRef[]> {
  return getDb()('revisions').where({ lab_id: labId, project_id: projectId }).orderBy([{ column: 'position' }, { column: 'label' }]).select<RevisionRef[]>('id', 'label', 'position');
}

export type ProjectTrend = { revisions: RevisionRef[]; readings: SetReading[]; trends: Record<MetricKey, Trend> };

/** Everything the trend chart needs for one project, or null when the project is not in this lab. */
export async function getProjectTrend(labId: string, projectId: string): Promise<ProjectTrend | null> {
  const project = await getDb()('projects').where({ lab_id: labId, id: projectId }).first('id');
  if (!project) return null;
  const [revisions, readings] = await Promise.all([listRevisionRefs(labId, projectId), listNewestReadings(labId, { projectId })]);
  return { revisions, readings, trends: buildTrends(revisions, readings) };
}

/** The data version of a projects row under `alias`, as SQL (getProjectDataVersion reads it; so does the actor's query). */
export const projectVersionSql = (alias: string): string => `${alias}.updated_at::text || '|' || ${alias}.data_version::text`;

/**
 * A fingerprint of everything a project's trend and readings list are built from: the project row
 * and its data version, which triggers move on inside every transaction that writes its readings,
 * capture sets, revisions or targets (migration 20270105090000). One primary-key lookup. Null when
 * the project is not in this lab.
 */
export async function getProjectDataVersion(labId: string, projectId: string): Promise<string | null> {
  const row = (await getDb()('projects')
    .where({ lab_id: labId, id: projectId })
    .first(getDb().raw(`${projectVersionSql('projects')} AS v`))) as { v: string } | undefined;
  return row?.v ?? null;
}
