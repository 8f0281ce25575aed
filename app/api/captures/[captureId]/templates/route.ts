import { NextResponse } from 'next/server';
import { listPhotos } from '@/db/queries/photos';
import { listRegionTemplates, saveRegionTemplate } from '@/db/queries/region-templates';
import { listRegions } from '@/db/queries/regions';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { AppError } from '@/lib/errors';
import { templateSaveSchema } from '@/lib/schemas/region';
import { captureSetOr404 } from '../../lookup';

type P = { captureId: string };

export const GET = withAuth<P>(
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    return NextResponse.json({ templates: await listRegionTemplates(actor.labId, set.projectId) });
  },
  { permission: 'capture.read' },
);

/** Saves this capture's saved regions as the project's template for a fixed camera jig. */
export const POST = withAuth<P>(
  async (req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const { name } = templateSaveSchema.parse(await readJson(req));
    const regions = await listRegions(actor.labId, set.id);
    const on = (await listPhotos(actor.labId, set.id)).find((p) => p.role === 'on');
    if (!on || regions.length === 0) throw new AppError(422, 'Save some regions on the on photo first', 'no_regions');
    const template = await saveRegionTemplate(actor.labId, actor.user.id, {
      projectId: set.projectId,
      name,
      imageWidth: on.width,
      imageHeight: on.height,
      regions: regions.map(({ kind, x, y, w, h }) => ({ kind, x, y, w, h })),
    });
    return NextResponse.json({ template }, { status: 201 });
  },
  { permission: 'template.write' },
);
