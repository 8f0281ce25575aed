import 'server-only';
import { getProject } from '@/db/queries/projects';
import { createReanalysisBatch, getBatchProgress, listOutdatedSets, type BatchProgress } from '@/db/queries/reanalyses';
import { getRevision } from '@/db/queries/revision-edits';
import { notFound } from '@/lib/errors';
import { ENGINE_VERSION } from '@/lib/photometry/version';
import { queueWaiting } from '@/lib/server/queue/reanalysis';

/**
 * Re-analyses with the current engine every capture set of the project (or of one of its
 * revisions) whose newest reading an older engine made. Null when there is none to re-analyse.
 * A project or revision of another lab answers 404.
 */
export async function startReanalysis(labId: string, userId: string, scope: { projectId: string; revisionId: string | null }): Promise<BatchProgress | null> {
  const project = await getProject(labId, scope.projectId);
  if (!project) throw notFound('No such project');
  if (scope.revisionId) {
    const revision = await getRevision(labId, scope.revisionId);
    if (!revision || revision.projectId !== scope.projectId) throw notFound('No such revision');
  }
  const sets = await listOutdatedSets(labId, scope, ENGINE_VERSION);
  if (sets.length === 0) return null;
  const id = await createReanalysisBatch(labId, userId, scope, ENGINE_VERSION, sets.map((s) => s.captureSetId));
  const batch = await getBatchProgress(labId, id);
  if (!batch) throw new Error('the batch just recorded is missing');
  return queueWaiting(labId, userId, batch);
}
