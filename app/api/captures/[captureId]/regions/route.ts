import { NextResponse } from 'next/server';
import { listPhotos } from '@/db/queries/photos';
import { listRegions, replaceRegions } from '@/db/queries/regions';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { AppError } from '@/lib/errors';
import { regionsOutside, regionsPutSchema } from '@/lib/schemas/region';
import { captureSetOr404 } from '../../lookup';

type P = { captureId: string };

export const GET = withAuth<P>(
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    return NextResponse.json({ regions: await listRegions(actor.labId, set.id) });
  },
  { permission: 'capture.read' },
);

export const PUT = withAuth<P>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const { regions } = regionsPutSchema.parse(await readJson(req));
    const on = (await listPhotos(actor.labId, set.id)).find((p) => p.role === 'on');
    if (!on && regions.length) throw new AppError(422, 'Upload the on photo first: regions are drawn in its pixels', 'no_photo');
    if (on) {
      const outside = regionsOutside(regions, on.width, on.height);
      if (Object.keys(outside).length) throw new AppError(422, 'A region reaches outside the photo', 'outside', outside);
    }
    return NextResponse.json({ regions: await replaceRegions(actor.labId, actor.user.id, set.id, regions) });
  },
  { permission: 'capture.write' },
);
