import { deleteCaptureSet } from '@/db/queries/capture-sets';
import { captureSetToken } from '@/db/queries/idempotency';
import { listPhotos } from '@/db/queries/photos';
import { listRegions } from '@/db/queries/regions';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { captureSetOr404 } from '@/lib/server/api-v1/lookup';
import { can } from '@/lib/auth/permissions';
import { AppError, notFound } from '@/lib/errors';
import { deleteKeys } from '@/lib/server/storage';

export const GET = rigRoute(
  'getCaptureSet',
  { permission: 'capture.read' },
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const [photos, regions] = await Promise.all([listPhotos(actor.labId, set.id), listRegions(actor.labId, set.id)]);
    return v1Answer('getCaptureSet', 200, { captureSet: set, photos, regions });
  },
);

/** A token deletes the capture sets it created; a role that may delete capture sets deletes any. */
export const DELETE = rigRoute(
  'deleteCaptureSet',
  { permission: 'capture.write' },
  async (_req, { actor, tokenId, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const own = tokenId !== null && (await captureSetToken(actor.labId, set.id)) === tokenId;
    if (!own && !can(actor.role, 'capture.delete')) throw new AppError(403, 'This token did not create this capture set, so it may not delete it', 'forbidden');
    const keys = await deleteCaptureSet(actor.labId, actor.user.id, set.id);
    if (!keys) throw notFound('No such capture set');
    await deleteKeys(keys);
    return new Response(null, { status: 204 });
  },
);
