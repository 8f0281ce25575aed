import { listRegionTemplates } from '@/db/queries/region-templates';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { captureSetOr404 } from '@/lib/server/api-v1/lookup';

export const GET = rigRoute(
  'listTemplates',
  { permission: 'capture.read' },
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    return v1Answer('listTemplates', 200, { templates: await listRegionTemplates(actor.labId, set.projectId) });
  },
);
