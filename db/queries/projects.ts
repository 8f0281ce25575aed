import { getDb } from '../index';
import { recordAudit } from './audit';

export type Project = {
  id: string;
  name: string;
  description: string;
  createdAt: Date;
  updatedAt: Date;
  revisionCount: number;
  captureCount: number;
  lastReadingAt: Date | null;
};

type Row = { id: string; name: string; description: string; created_at: Date; updated_at: Date; revision_count?: string | number; capture_count?: string | number; last_reading_at?: Date | null };

const toProject = (r: Row): Project => ({
  id: r.id,
  name: r.name,
  description: r.description,
  createdAt: r.created_at,
  updatedAt: r.updated_at,
  revisionCount: Number(r.revision_count ?? 0),
  captureCount: Number(r.capture_count ?? 0),
  lastReadingAt: r.last_reading_at ?? null,
});

function withCounts(labId: string) {
  const db = getDb();
  return db('projects as p')
    .where('p.lab_id', labId)
    .select(
      'p.*',
      db.raw('(SELECT count(*) FROM revisions r WHERE r.project_id = p.id) AS revision_count'),
      db.raw('(SELECT count(*) FROM capture_sets c JOIN revisions r ON r.id = c.revision_id WHERE r.project_id = p.id) AS capture_count'),
      db.raw('(SELECT max(created_at) FROM readings g WHERE g.project_id = p.id) AS last_reading_at'),
    );
}

export async function listProjects(labId: string): Promise<Project[]> {
  const rows: Row[] = await withCounts(labId).orderBy('p.name');
  return rows.map(toProject);
}

/**
 * Each project's highest-placed revision that has readings, one row per project (project_id, id,
 * label): the revision the projects list and the target status speak of. project_id in the filter
 * lets the readings index serve it.
 */
export function newestMeasuredRevisions(labId: string) {
  const db = getDb();
  return db('revisions as r')
    .where('r.lab_id', labId)
    .whereExists(db('readings as g').whereRaw('g.project_id = r.project_id AND g.revision_id = r.id'))
    .select(db.raw('DISTINCT ON (r.project_id) r.project_id, r.id, r.label'))
    .orderBy([{ column: 'r.project_id' }, { column: 'r.position', order: 'desc' }]);
}

/** A project's newest revision with readings, and the means over its capture sets' newest readings. */
export type ProjectLatest = { projectId: string; revisionLabel: string; captures: number; acr: number | null; ghost: number | null; transmission: number | null };

/** For each project of the lab that has readings: its newest measured revision and its means. */
export async function listProjectLatest(labId: string): Promise<Map<string, ProjectLatest>> {
  const db = getDb();
  const rows: { project_id: string; label: string; captures: number; acr: number | null; ghost: number | null; transmission: number | null }[] = await db
    .from(newestMeasuredRevisions(labId).as('lr'))
    .joinRaw(
      `JOIN LATERAL (SELECT DISTINCT ON (g.capture_set_id) g.ambient_contrast_ratio, g.ghost_ratio, g.transmission
                       FROM readings g
                      WHERE g.project_id = lr.project_id AND g.revision_id = lr.id
                      ORDER BY g.capture_set_id, g.created_at DESC) n ON true`,
    )
    .groupBy('lr.project_id', 'lr.label')
    .select('lr.project_id', 'lr.label', db.raw('count(n.ambient_contrast_ratio)::int AS captures'), db.raw('avg(n.ambient_contrast_ratio) AS acr'), db.raw('avg(n.ghost_ratio) AS ghost'), db.raw('avg(n.transmission) AS transmission'));
  return new Map(rows.map((r) => [r.project_id, { projectId: r.project_id, revisionLabel: r.label, captures: r.captures, acr: r.acr, ghost: r.ghost, transmission: r.transmission }]));
}

export async function getProject(labId: string, id: string): Promise<Project | null> {
  const row: Row | undefined = await withCounts(labId).andWhere('p.id', id).first();
  return row ? toProject(row) : null;
}

/** A project's id and name only (report headings), or null for another lab's or a missing one. */
export async function getProjectName(labId: string, id: string): Promise<{ id: string; name: string } | null> {
  const row = await getDb()('projects').where({ lab_id: labId, id }).first<{ id: string; name: string } | undefined>('id', 'name');
  return row ?? null;
}

export async function createProject(labId: string, userId: string, input: { name: string; description?: string }): Promise<Project> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('projects')
      .insert({ lab_id: labId, name: input.name, description: input.description ?? '' })
      .returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'project.create', targetType: 'project', targetId: row.id, details: { name: input.name } }, trx);
    return toProject(row);
  });
}

/** Returns null when the project is not in this lab. */
export async function updateProject(labId: string, userId: string, id: string, input: { name?: string; description?: string }): Promise<Project | null> {
  return getDb().transaction(async (trx) => {
    const patch: Record<string, unknown> = { updated_at: trx.fn.now() };
    if (input.name !== undefined) patch.name = input.name;
    if (input.description !== undefined) patch.description = input.description;
    const [row] = await trx('projects').where({ lab_id: labId, id }).update(patch).returning<Row[]>('*');
    if (!row) return null;
    await recordAudit({ labId, userId, action: 'project.update', targetType: 'project', targetId: id, details: input }, trx);
    return toProject(row);
  });
}

export async function deleteProject(labId: string, userId: string, id: string): Promise<boolean> {
  return getDb().transaction(async (trx) => {
    const n = await trx('projects').where({ lab_id: labId, id }).delete();
    if (n === 0) return false;
    await recordAudit({ labId, userId, action: 'project.delete', targetType: 'project', targetId: id }, trx);
    return true;
  });
}
