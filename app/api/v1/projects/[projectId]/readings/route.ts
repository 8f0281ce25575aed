import { listNewestReadingsPage } from '@/db/queries/trends';
import { conditionalProjectRead, rigRoute, v1Bytes } from '@/lib/server/api-v1/handler';
import { idOr404 } from '@/lib/server/api-v1/lookup';

/** The readings list of a project, a page at a time: ?limit=1…500 (50) and ?offset=0…; ETag from the project's data version. */
export const GET = rigRoute(
  'listReadings',
  { permission: 'project.read' },
  async (req, { actor, params, query }) => {
    const projectId = idOr404(params.projectId, 'project');
    const { limit, offset } = query;
    return conditionalProjectRead(req, actor.labId, projectId, `readings:${limit}:${offset}`, () => ({ 'content-type': 'application/json' }), async () => {
      const { readings, total } = await listNewestReadingsPage(actor.labId, projectId, { limit, offset });
      return { body: v1Bytes('listReadings', 200, { readings, total, limit, offset }), meta: {} };
    });
  },
);
