import { NextResponse } from 'next/server';
import { listPhotos } from '@/db/queries/photos';
import { getRegionTemplate } from '@/db/queries/region-templates';
import { replaceRegions } from '@/db/queries/regions';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { AppError, notFound } from '@/lib/errors';
import { templateApplySchema, type RegionInput } from '@/lib/schemas/region';
import { captureSetOr404 } from '../../../lookup';

/** Applies a project template, scaled when this camera's photo has another size than the template's. */
export const POST = withAuth<{ captureId: string }>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const { templateId } = templateApplySchema.parse(await readJson(req));
    const template = await getRegionTemplate(actor.labId, templateId);
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
    return NextResponse.json({ regions: await replaceRegions(actor.labId, actor.user.id, set.id, regions) });
  },
  { permission: 'capture.write' },
);
