import { NextResponse } from 'next/server';
import { deleteCaptureSet, updateCaptureSet } from '@/db/queries/capture-sets';
import { listPhotos } from '@/db/queries/photos';
import { listRegions } from '@/db/queries/regions';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { captureSetUpdateSchema } from '@/lib/schemas/capture-set';
import { deleteKeys } from '@/lib/server/storage';
import { captureSetOr404, idOr404 } from '../lookup';

type P = { captureId: string };

export const GET = withAuth<P>(
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const [photos, regions] = await Promise.all([listPhotos(actor.labId, set.id), listRegions(actor.labId, set.id)]);
    // storage keys are internal: the client addresses photos by id
    return NextResponse.json({ captureSet: set, photos: photos.map(({ storageKey: _s, previewKey: _p, ...p }) => p), regions });
  },
  { permission: 'capture.read' },
);

export const PATCH = withAuth<P>(
  async (req, { actor, params }) => {
    const id = idOr404(params.captureId, 'capture set');
    const input = captureSetUpdateSchema.parse(await readJson(req));
    const set = await updateCaptureSet(actor.labId, actor.user.id, id, input);
    if (!set) throw notFound('No such capture set');
    return NextResponse.json({ captureSet: set });
  },
  { permission: 'capture.write' },
);

export const DELETE = withAuth<P>(
  async (_req, { actor, params }) => {
    const keys = await deleteCaptureSet(actor.labId, actor.user.id, idOr404(params.captureId, 'capture set'));
    if (!keys) throw notFound('No such capture set');
    await deleteKeys(keys);
    return new NextResponse(null, { status: 204 });
  },
  { permission: 'capture.delete' },
);
