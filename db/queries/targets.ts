import type { Knex } from 'knex';
import { getDb } from '../index';
import { recordAudit } from './audit';
import { toCondition, type TargetCondition } from '../../lib/targets/conditions';
import { checkTargetsOn, type Target, type TargetCheck } from '../../lib/targets/evaluate';
import { isMetricKey, type MetricKey } from '../../lib/targets/metrics';
import { newestMeasuredRevisions } from './projects';
import { listNewestReadings } from './trends';

type Row = { id: string; project_id: string; metric: string; comparator: '>=' | '<='; value: number; condition_note: string; condition?: unknown; variants?: unknown; is_default: boolean };

const toVariants = (v: unknown): string[] => (Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string') : []);

const toTarget = (r: Row): Target => ({
  id: r.id,
  projectId: r.project_id,
  metric: (isMetricKey(r.metric) ? r.metric : 'ambientContrastRatio') as MetricKey,
  comparator: r.comparator,
  value: r.value,
  conditionNote: r.condition_note,
  condition: toCondition(r.condition),
  variants: toVariants(r.variants),
  isDefault: r.is_default,
});

export type TargetWrite = { metric: MetricKey; comparator: '>=' | '<='; value: number; conditionNote: string; condition?: TargetCondition; variants?: string[]; isDefault: boolean };

const columns = (input: TargetWrite) => ({
  metric: input.metric,
  comparator: input.comparator,
  value: input.value,
  condition_note: input.conditionNote,
  condition: JSON.stringify(toCondition(input.condition ?? {})),
  variants: JSON.stringify(input.variants ?? []),
  is_default: input.isDefault,
});

export async function listTargets(labId: string, projectId: string, db: Knex | Knex.Transaction = getDb()): Promise<Target[]> {
  const rows: Row[] = await db('targets').where({ lab_id: labId, project_id: projectId }).orderBy([{ column: 'metric' }, { column: 'created_at' }]);
  return rows.filter((r) => isMetricKey(r.metric)).map(toTarget);
}

/** Returns null when the project is not in this lab. */
export async function createTarget(labId: string, userId: string, projectId: string, input: TargetWrite): Promise<Target | null> {
  return getDb().transaction(async (trx) => {
    const project = await trx('projects').where({ lab_id: labId, id: projectId }).first('id');
    if (!project) return null;
    const [row] = await trx('targets')
      .insert({ lab_id: labId, project_id: projectId, ...columns(input) })
      .returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'target.create', targetType: 'target', targetId: row.id, details: { projectId, ...input } }, trx);
    return toTarget(row);
  });
}

/** Returns null when the target is not in this lab's project. A changed target is judged afresh. */
export async function updateTarget(labId: string, userId: string, projectId: string, id: string, input: TargetWrite): Promise<Target | null> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('targets')
      .where({ lab_id: labId, project_id: projectId, id })
      .update({ ...columns(input), updated_at: trx.fn.now() })
      .returning<Row[]>('*');
    if (!row) return null;
    await trx('target_states').where({ lab_id: labId, target_id: id }).delete();
    await recordAudit({ labId, userId, action: 'target.update', targetType: 'target', targetId: id, details: { projectId, ...input } }, trx);
    return toTarget(row);
  });
}

export async function deleteTarget(labId: string, userId: string, projectId: string, id: string): Promise<boolean> {
  return getDb().transaction(async (trx) => {
    const n = await trx('targets').where({ lab_id: labId, project_id: projectId, id }).delete();
    if (n === 0) return false;
    await recordAudit({ labId, userId, action: 'target.delete', targetType: 'target', targetId: id, details: { projectId } }, trx);
    return true;
  });
}

/** Each target of the project judged on each variant of one revision's newest readings. */
export async function checkRevisionTargets(labId: string, projectId: string, revisionId: string): Promise<TargetCheck[]> {
  const [targets, readings] = await Promise.all([listTargets(labId, projectId), listNewestReadings(labId, { projectId, revisionId })]);
  return checkTargetsOn(targets, readings);
}

export type ProjectTargetStatus = { projectId: string; revisionId: string | null; revisionLabel: string | null; checks: TargetCheck[] };

/**
 * Per project: its targets judged on the latest revision (by order) that has readings — what the
 * projects list shows as the project's status.
 */
export async function listProjectTargetStatus(labId: string): Promise<Map<string, ProjectTargetStatus>> {
  const db = getDb();
  const [targetRows, latest] = await Promise.all([
    db('targets').where({ lab_id: labId }).select<Row[]>('*'),
    newestMeasuredRevisions(labId) as Promise<{ project_id: string; id: string; label: string }[]>,
  ]);
  const out = new Map<string, ProjectTargetStatus>();
  const targetsByProject = new Map<string, Target[]>();
  for (const r of targetRows) {
    if (!isMetricKey(r.metric)) continue;
    const list = targetsByProject.get(r.project_id) ?? [];
    list.push(toTarget(r));
    targetsByProject.set(r.project_id, list);
  }
  const latestBy = new Map(latest.map((l) => [l.project_id, l]));
  for (const [projectId, targets] of targetsByProject) {
    const rev = latestBy.get(projectId);
    if (!rev) {
      out.set(projectId, { projectId, revisionId: null, revisionLabel: null, checks: checkTargetsOn(targets, []) });
      continue;
    }
    const readings = await listNewestReadings(labId, { projectId, revisionId: rev.id });
    out.set(projectId, { projectId, revisionId: rev.id, revisionLabel: rev.label, checks: checkTargetsOn(targets, readings) });
  }
  return out;
}

/** The variant names used in a project's capture sets, for pickers (a typo would split a group). */
export async function listProjectVariants(labId: string, projectId: string): Promise<string[]> {
  const rows: { variant: string }[] = await getDb()('capture_sets as c')
    .join('revisions as r', 'r.id', 'c.revision_id')
    .where({ 'c.lab_id': labId, 'r.project_id': projectId })
    .whereNot('c.variant', '')
    .distinct('c.variant')
    .orderBy('c.variant');
  return rows.map((r) => r.variant);
}

/**
 * Records whether a target fails on a revision (on one variant of it) and says whether that is news: true only when the
 * state was unknown or the opposite before. One statement, so two workers finishing at once
 * cannot both see the change.
 */
export async function recordTargetState(labId: string, targetId: string, revisionId: string, failing: boolean, variant = ''): Promise<boolean> {
  const res = await getDb().raw(
    `INSERT INTO target_states (lab_id, target_id, revision_id, variant, failing) VALUES (?, ?, ?, ?, ?)
     ON CONFLICT (target_id, revision_id, variant) DO UPDATE SET failing = EXCLUDED.failing, changed_at = now()
     WHERE target_states.failing IS DISTINCT FROM EXCLUDED.failing
     RETURNING failing`,
    [labId, targetId, revisionId, variant, failing],
  );
  return (res.rows as unknown[]).length > 0;
}

/** Forgets a recorded target state, so the next reading judges it as news again (a mail that could not be sent). */
export async function forgetTargetState(labId: string, targetId: string, revisionId: string, variant = ''): Promise<void> {
  await getDb()('target_states').where({ lab_id: labId, revision_id: revisionId, target_id: targetId, variant }).delete();
}

/** The names a target mail needs for a revision of the lab, or null when the lab has no such revision. */
export async function getRevisionForMail(labId: string, revisionId: string): Promise<{ projectId: string; projectName: string; label: string } | null> {
  const row = await getDb()('revisions as r')
    .join('projects as p', 'p.id', 'r.project_id')
    .where({ 'r.lab_id': labId, 'r.id': revisionId })
    .first<{ project_id: string; project_name: string; label: string } | undefined>('r.project_id', 'p.name as project_name', 'r.label');
  return row ? { projectId: row.project_id, projectName: row.project_name, label: row.label } : null;
}

/** E-mail addresses of the lab's leads, who own targets. */
export async function listLeadEmails(labId: string): Promise<string[]> {
  const rows = await getDb()('memberships as m').join('users as u', 'u.id', 'm.user_id').where({ 'm.lab_id': labId, 'm.role': 'lead' }).orderBy('u.email').select<{ email: string }[]>('u.email');
  return rows.map((r) => r.email);
}
