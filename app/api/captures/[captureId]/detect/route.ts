import { NextResponse } from 'next/server';
import { listPhotos } from '@/db/queries/photos';
import { withAuth } from '@/lib/server/auth/with-auth';
import { AppError } from '@/lib/errors';
import { isEngineInputError } from '@/lib/photometry/errors';
import { photoEncoding } from '@/lib/schemas/capture-set';
import { getStorage } from '@/lib/server/storage';
import { captureSetOr404 } from '../../lookup';
import { detectScreenRect } from './detect';

export const POST = withAuth<{ captureId: string }>(
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const photos = await listPhotos(actor.labId, set.id);
    const on = photos.find((p) => p.role === 'on');
    const off = photos.find((p) => p.role === 'off');
    if (!on || !off) throw new AppError(422, 'Detection compares the on and off photos: upload both first', 'no_photo');
    const storage = getStorage();
    const [a, b] = await Promise.all([storage.get(on.storageKey), storage.get(off.storageKey)]);
    if (!a || !b) throw new AppError(422, 'A stored photo is missing: upload it again', 'missing');
    try {
      const screen = await detectScreenRect(a, b, { on: photoEncoding(set.tiffEncoding, on).linear, off: photoEncoding(set.tiffEncoding, off).linear });
      if (!screen) throw new AppError(422, 'No display light found: is the pattern showing in the on photo and dark in the off photo? Draw the screen by hand.', 'no_screen');
      return NextResponse.json({ screen: { ...screen, kind: 'screen', source: 'detected' } });
    } catch (e) {
      if (isEngineInputError(e)) throw new AppError(422, e.message, e.code);
      throw e;
    }
  },
  { permission: 'capture.write' },
);
