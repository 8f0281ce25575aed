import { NextResponse } from 'next/server';
import { deletePhoto, getPhoto } from '@/db/queries/photos';
import { withAuth } from '@/lib/auth/with-auth';
import { notFound } from '@/lib/errors';
import { deleteKeys } from '@/lib/storage';
import { captureSetOr404, idOr404 } from '../../../lookup';

type P = { captureId: string; photoId: string };

export const DELETE = withAuth<P>(
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const photo = await getPhoto(actor.labId, idOr404(params.photoId, 'photo'));
    if (!photo || photo.captureSetId !== set.id) throw notFound('No such photo');
    const keys = await deletePhoto(actor.labId, actor.user.id, photo.id);
    if (keys) await deleteKeys(keys);
    return new NextResponse(null, { status: 204 });
  },
  { permission: 'capture.write' },
);
