import { getDb } from '../index';
import { recordAudit } from './audit';
import type { RevisionStatus } from './revisions';

export type RevisionDetail = {
  id: string;
  projectId: string;
  projectName: string;
  label: string;
  position: number;
  builtOn: string | null;
  notes: string;
  status: RevisionStatus;
  createdAt: Date;
  updatedAt: Date;
};

type Row = { id: string; project_id: string; project_name?: string; label: string; position: number; built_on: Date | string | null; notes: string; status: RevisionStatus; created_at: Date; updated_at: Date };

// A DATE column comes back as a Date at local midnight; format it in local time so the day does not shift.
function isoDay(d: Date | string | null): string | null {
  if (!d) return null;
  if (typeof d === 'string') return d.slice(0, 10);
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
}

const toDetail = (r: Row): RevisionDetail => ({
  id: r.id,
  projectId: r.project_id,
  projectName: r.project_name ?? '',
  label: r.label,
  position: r.position,
  builtOn: isoDay(r.built_on),
  notes: r.notes,
  status: r.status,
  createdAt: r.created_at,
  updatedAt: r.updated_at,
});

export type RevisionWrite = { label?: string; builtOn?: string | null; position?: number; notes?: string; status?: RevisionStatus };

export async function getRevision(labId: string, id: string): Promise<RevisionDetail | null> {
  const row: Row | undefined = await getDb()('revisions as r')
    .join('projects as p', 'p.id', 'r.project_id')
    .where({ 'r.lab_id': labId, 'r.id': id })
    .first('r.*', 'p.name as project_name');
  return row ? toDetail(row) : null;
}

/** Returns null when the project is not in this lab. New revisions go last unless an order is given. */
export async function createRevision(labId: string, userId: string, projectId: string, input: RevisionWrite & { label: string }): Promise<RevisionDetail | null> {
  return getDb().transaction(async (trx) => {
    const project = await trx('projects').where({ lab_id: labId, id: projectId }).first('id', 'name');
    if (!project) return null;
    let position = input.position;
    if (position === undefined) {
      const max = await trx('revisions').where({ lab_id: labId, project_id: projectId }).max<{ max: number | null }>('position as max').first();
      position = Number(max?.max ?? 0) + 1;
    }
    const [row] = await trx('revisions')
      .insert({ lab_id: labId, project_id: projectId, label: input.label, position, built_on: input.builtOn ?? null, notes: input.notes ?? '', status: input.status ?? 'planned' })
      .returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'revision.create', targetType: 'revision', targetId: row.id, details: { label: input.label, projectId } }, trx);
    return toDetail({ ...row, project_name: project.name as string });
  });
}

/** Returns null when the revision is not in this lab. */
export async function updateRevision(labId: string, userId: string, id: string, input: RevisionWrite): Promise<RevisionDetail | null> {
  return getDb().transaction(async (trx) => {
    const patch: Record<string, unknown> = { updated_at: trx.fn.now() };
    if (input.label !== undefined) patch.label = input.label;
    if (input.builtOn !== undefined) patch.built_on = input.builtOn;
    if (input.position !== undefined) patch.position = input.position;
    if (input.notes !== undefined) patch.notes = input.notes;
    if (input.status !== undefined) patch.status = input.status;
    const [row] = await trx('revisions').where({ lab_id: labId, id }).update(patch).returning<Row[]>('*');
    if (!row) return null;
    await recordAudit({ labId, userId, action: 'revision.update', targetType: 'revision', targetId: id, details: input }, trx);
    const project = await trx('projects').where({ id: row.project_id }).first('name');
    return toDetail({ ...row, project_name: (project?.name as string | undefined) ?? '' });
  });
}
