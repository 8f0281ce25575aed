import { getProjectDataVersion } from '../../../db/queries/trends';
import type { Actor } from '../auth/session';
import { notFound } from '../../errors';
import { cachedAnswer, cachedBody, type CachedBody } from './read-cache';

/**
 * A project's read (trend, readings list page, CSV) answered from the read cache: the project's
 * data version first, so a cached body is never older than its key, then the body built once per
 * version, then sent as cachedAnswer sends it. Another lab's or an unknown project is 404. The
 * version comes with the actor when withAuth was told the project (`projectParam`), else from
 * its own query.
 */
export async function projectAnswer(
  req: Request,
  actor: Pick<Actor, 'labId' | 'project'>,
  projectId: string,
  kind: string,
  headers: (meta: Record<string, string>) => Record<string, string>,
  build: () => Promise<CachedBody>,
): Promise<Response> {
  const { labId } = actor;
  const version = actor.project?.id === projectId ? actor.project.version : await getProjectDataVersion(labId, projectId);
  if (!version) throw notFound('No such project');
  const cached = await cachedBody(kind, labId, projectId, version, build);
  return cachedAnswer(req, cached, headers(cached.meta));
}
