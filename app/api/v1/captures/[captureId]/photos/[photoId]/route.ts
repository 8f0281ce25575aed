import { getPhoto, setPhotoEncoding } from '@/db/queries/photos';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { captureSetOr404, idOr404 } from '@/lib/server/api-v1/lookup';
import { AppError, notFound } from '@/lib/errors';

/** Declares how this photo's values encode light ({ encoding: 'linear' | 'srgb' | null }); null follows the set and the file. */
export const PATCH = rigRoute(
  'setPhotoEncoding',
  { permission: 'capture.write' },
  async (_req, { actor, params, input }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const photo = await getPhoto(actor.labId, idOr404(params.photoId, 'photo'));
    if (!photo || photo.captureSetId !== set.id) throw notFound('No such photo');
    const { encoding } = input;
    if (encoding === 'linear' && !(photo.format === 'tiff' && photo.bitDepth === 16)) {
      throw new AppError(422, `${photo.originalName || 'This photo'} is ${photo.bitDepth === 8 ? 'an' : 'a'} ${photo.bitDepth}-bit ${photo.format.toUpperCase()}, so it cannot be declared linear: only 16-bit TIFFs can.`, 'not_linear', { encoding: ['Only a 16-bit TIFF can be linear'] });
    }
    const updated = await setPhotoEncoding(actor.labId, actor.user.id, set.id, photo.id, encoding);
    if (!updated) throw notFound('No such photo');
    return v1Answer('setPhotoEncoding', 200, { photo: updated });
  },
);
