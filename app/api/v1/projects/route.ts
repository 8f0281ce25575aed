import { listProjects } from '@/db/queries/projects';
import { listRevisions } from '@/db/queries/revisions';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';

/** The lab's projects with their revisions, so a rig can find where its captures belong. */
export const GET = rigRoute(
  'listProjects',
  { permission: 'project.read' },
  async (_req, { actor }) => {
    const projects = await listProjects(actor.labId);
    const out = [];
    for (const p of projects) out.push({ id: p.id, name: p.name, revisions: await listRevisions(actor.labId, p.id) });
    return v1Answer('listProjects', 200, { projects: out });
  },
);
