import { NextResponse } from 'next/server';
import { listAnalyses } from '@/db/queries/analyses';
import { listPhotos } from '@/db/queries/photos';
import { withAuth } from '@/lib/server/auth/with-auth';
import { AppError } from '@/lib/errors';
import { requestAnalysis } from '@/lib/server/queue/producer';
import { photoEncoding } from '@/lib/schemas/capture-set';
import { captureSetOr404 } from '../../lookup';

type P = { captureId: string };

export const GET = withAuth<P>(
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    return NextResponse.json({ analyses: await listAnalyses(actor.labId, set.id) });
  },
  { permission: 'capture.read' },
);

export const POST = withAuth<P>(
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const photos = await listPhotos(actor.labId, set.id);
    const roles = new Set(photos.map((p) => p.role));
    const missing = (['on', 'off'] as const).filter((r) => !roles.has(r));
    if (missing.length) throw new AppError(422, `Upload the ${missing.join(' and ')} photo${missing.length > 1 ? 's' : ''} before analysing`, 'no_photo');
    const conflict = photos.map((p) => photoEncoding(set.tiffEncoding, p).conflict).find((c) => c !== null);
    if (conflict) throw new AppError(422, `${conflict}.`, 'encoding_conflict');
    const { analysis, enqueued } = await requestAnalysis(actor.labId, actor.user.id, set.id);
    const message = enqueued ? 'Analysis queued' : 'The job queue is not reachable right now. The analysis is saved and will start as soon as the queue is back.';
    return NextResponse.json({ analysis, enqueued, message }, { status: 202 });
  },
  { permission: 'analysis.run' },
);
