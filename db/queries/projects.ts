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

/** A project's newest revision with readings, and the means over its capture sets' newest readings. */
export type ProjectLatest = { projectId: string; revisionLabel: string; captures: number; acr: number | null; ghost: number | null; transmission: number | null };

/** For each project of the lab that has readings: its highest-placed revision with readings and its means (project_id in each filter lets the readings index serve). */
export async function listProjectLatest(labId: string): Promise<Map<string, ProjectLatest>> {
  const res = await getDb().raw(
    `SELECT lr.project_id, lr.label, count(n.ambient_contrast_ratio)::int AS captures,
            avg(n.ambient_contrast_ratio) AS acr, avg(n.ghost_ratio) AS ghost, avg(n.transmission) AS transmission
       FROM (SELECT DISTINCT ON (r.project_id) r.project_id, r.id, r.label
               FROM revisions r
              WHERE r.lab_id = ? AND EXISTS (SELECT 1 FROM readings g WHERE g.project_id = r.project_id AND g.revision_id = r.id)
              ORDER BY r.project_id, r.position DESC) lr
       JOIN LATERAL (SELECT DISTINCT ON (g.capture_set_id) g.ambient_contrast_ratio, g.ghost_ratio, g.transmission
                       FROM readings g
                      WHERE g.project_id = lr.project_id AND g.revision_id = lr.id
                      ORDER BY g.capture_set_id, g.created_at DESC) n ON true
      GROUP BY lr.project_id, lr.label`,
    [labId],
  );
  const rows = res.rows as { project_id: string; label: string; captures: number; acr: number | null; ghost: number | null; transmission: number | null }[];
  return new Map(rows.map((r) => [r.project_id, { projectId: r.project_id, revisionLabel: r.label, captures: r.captures, acr: r.acr, ghost: r.ghost, transmission: r.transmission }]));
}

export async function getProject(labId: string, id: string): Promise<Project | null> {
  const row: Row | undefined = await withCounts(labId).andWhere('p.id', id).first();
  return row ? toProject(row) : null;
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
