import type { Metadata } from 'next';
import { getCaptureSet } from '../../db/queries/capture-sets';
import { getProjectName } from '../../db/queries/projects';
import { getRevision } from '../../db/queries/revision-edits';
import { uuidSchema } from '../schemas/common';
import { getActor } from './auth/session';

// Each page's <title> names its record, then " — Veilmeter" as every title does. The record is read
// with the same lab-scoped queries as the page, so an id of another lab (or none) gives the same
// "Not found" as a missing one and never its name.
// absolute: the root layout's title template does not reach a title set by a nested layout
const SUFFIX = ' — Veilmeter';
const NOT_FOUND: Metadata = { title: { absolute: `Not found${SUFFIX}` } };
const titled = (...parts: (string | undefined)[]): Metadata => ({ title: { absolute: `${parts.filter(Boolean).join(' · ')}${SUFFIX}` } });

/** "<what> · <project>", e.g. "Compare · Visor VX birdbath". */
export async function projectTitle(projectId: string, what?: string): Promise<Metadata> {
  const actor = await getActor();
  if (!actor || !uuidSchema.safeParse(projectId).success) return NOT_FOUND;
  const project = await getProjectName(actor.labId, projectId);
  return project ? titled(what, project.name) : NOT_FOUND;
}

/** "<what> · <revision> · <project>", e.g. "VX-B · Visor VX birdbath"; only for the project in the address. */
export async function revisionTitle(projectId: string, revisionId: string, what?: string): Promise<Metadata> {
  const actor = await getActor();
  if (!actor || !uuidSchema.safeParse(revisionId).success) return NOT_FOUND;
  const revision = await getRevision(actor.labId, revisionId);
  return revision && revision.projectId === projectId ? titled(what, revision.label, revision.projectName) : NOT_FOUND;
}

/** "<capture set> · <revision> · <project>". */
export async function captureTitle(captureId: string): Promise<Metadata> {
  const actor = await getActor();
  if (!actor || !uuidSchema.safeParse(captureId).success) return NOT_FOUND;
  const set = await getCaptureSet(actor.labId, captureId);
  return set ? titled(set.label, set.revisionLabel, set.projectName) : NOT_FOUND;
}
