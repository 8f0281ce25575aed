import { getDb } from '../index';

export type RevisionStatus = 'planned' | 'built' | 'measured' | 'retired';
export type Revision = {
  id: string;
  projectId: string;
  label: string;
  position: number;
  builtOn: string | null;
  notes: string;
  status: RevisionStatus;
  stack: unknown;
  captureCount: number;
  createdAt: Date;
};

type Row = { id: string; project_id: string; label: string; position: number; built_on: Date | string | null; notes: string; status: RevisionStatus; stack: unknown; capture_count?: string | number; created_at: Date };

const toRevision = (r: Row): Revision => ({
  id: r.id,
  projectId: r.project_id,
  label: r.label,
  position: r.position,
  builtOn: r.built_on ? (typeof r.built_on === 'string' ? r.built_on.slice(0, 10) : r.built_on.toISOString().slice(0, 10)) : null,
  notes: r.notes,
  status: r.status,
  stack: r.stack,
  captureCount: Number(r.capture_count ?? 0),
  createdAt: r.created_at,
});

export async function listRevisions(labId: string, projectId: string): Promise<Revision[]> {
  const db = getDb();
  const rows: Row[] = await db('revisions as r')
    .where({ 'r.lab_id': labId, 'r.project_id': projectId })
    .select('r.*', db.raw('(SELECT count(*) FROM capture_sets c WHERE c.revision_id = r.id) AS capture_count'))
    .orderBy('r.position');
  return rows.map(toRevision);
}
