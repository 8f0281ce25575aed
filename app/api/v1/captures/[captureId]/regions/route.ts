import { listPhotos } from '@/db/queries/photos';
import { listRegions, replaceRegions } from '@/db/queries/regions';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { captureSetOr404 } from '@/lib/server/api-v1/lookup';
import { AppError } from '@/lib/errors';
import { regionsOutside } from '@/lib/schemas/region';

export const GET = rigRoute(
  'getRegions',
  { permission: 'capture.read' },
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    return v1Answer('getRegions', 200, { regions: await listRegions(actor.labId, set.id) });
  },
);

/** Replaces the set's regions; each must lie inside the on photo. */
export const PUT = rigRoute(
  'putRegions',
  { permission: 'capture.write' },
  async (_req, { actor, params, input }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const { regions } = input;
    const on = (await listPhotos(actor.labId, set.id)).find((p) => p.role === 'on');
    if (!on && regions.length) throw new AppError(422, 'Upload the on photo first: regions are drawn in its pixels', 'no_photo');
    if (on) {
      const outside = regionsOutside(regions, on.width, on.height);
      if (Object.keys(outside).length) throw new AppError(422, 'A region reaches outside the photo', 'outside', outside);
    }
    return v1Answer('putRegions', 200, { regions: await replaceRegions(actor.labId, actor.user.id, set.id, regions) });
  },
);
