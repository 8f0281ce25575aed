import { NextResponse } from 'next/server';
import { deletePhoto, getPhoto, setPhotoEncoding } from '@/db/queries/photos';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { AppError, notFound } from '@/lib/errors';
import { isRawFormat } from '@/lib/image/raw-formats';
import { photoEncodingSchema } from '@/lib/schemas/capture-set';
import { deleteKeys } from '@/lib/server/storage';
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

/** Declares how this photo's values encode light ({ encoding: 'linear' | 'srgb' | null }); null follows the set and the file. */
export const PATCH = withAuth<P>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const photo = await getPhoto(actor.labId, idOr404(params.photoId, 'photo'));
    if (!photo || photo.captureSetId !== set.id) throw notFound('No such photo');
    const { encoding } = photoEncodingSchema.parse(await readJson(req));
    if (encoding !== null && isRawFormat(photo.format)) {
      throw new AppError(422, `${photo.originalName || 'This photo'} is a camera raw file, which is always read as linear light: there is nothing to declare.`, 'raw_always_linear', { encoding: ['A camera raw photo is always linear'] });
    }
    if (encoding === 'linear' && !(photo.format === 'tiff' && photo.bitDepth === 16)) {
      throw new AppError(422, `${photo.originalName || 'This photo'} is ${photo.bitDepth === 8 ? 'an' : 'a'} ${photo.bitDepth}-bit ${photo.format.toUpperCase()}, so it cannot be declared linear: only 16-bit TIFFs can.`, 'not_linear', { encoding: ['Only a 16-bit TIFF can be linear'] });
    }
    const updated = await setPhotoEncoding(actor.labId, actor.user.id, set.id, photo.id, encoding);
    if (!updated) throw notFound('No such photo');
    const { storageKey: _s, previewKey: _p, ...shown } = updated;
    return NextResponse.json({ photo: shown });
  },
  { permission: 'capture.write' },
);
