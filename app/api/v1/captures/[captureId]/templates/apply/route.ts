import { listPhotos } from '@/db/queries/photos';
import { getRegionTemplate } from '@/db/queries/region-templates';
import { replaceRegions } from '@/db/queries/regions';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { captureSetOr404 } from '@/lib/server/api-v1/lookup';
import { AppError, notFound } from '@/lib/errors';
import type { RegionInput } from '@/lib/schemas/region';

/** Places a project template on the on photo, scaled when its size differs from the template's. */
export const POST = rigRoute(
  'applyTemplate',
  { permission: 'capture.write' },
  async (_req, { actor, params, input }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const template = await getRegionTemplate(actor.labId, input.templateId);
    if (!template || template.projectId !== set.projectId) throw notFound('No such template in this project');
    const on = (await listPhotos(actor.labId, set.id)).find((p) => p.role === 'on');
    if (!on) throw new AppError(422, 'Upload the on photo first: the template is placed on it', 'no_photo');
    const sx = on.width / template.imageWidth;
    const sy = on.height / template.imageHeight;
    const regions: RegionInput[] = template.regions.map((r) => {
      const x = Math.min(on.width - 1, Math.max(0, Math.round(r.x * sx)));
      const y = Math.min(on.height - 1, Math.max(0, Math.round(r.y * sy)));
      return { kind: r.kind, x, y, w: Math.max(1, Math.min(on.width - x, Math.round(r.w * sx))), h: Math.max(1, Math.min(on.height - y, Math.round(r.h * sy))), source: 'template' };
    });
    return v1Answer('applyTemplate', 200, { regions: await replaceRegions(actor.labId, actor.user.id, set.id, regions) });
  },
);
