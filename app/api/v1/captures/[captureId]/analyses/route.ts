import { listAnalyses } from '@/db/queries/analyses';
import { listPhotos } from '@/db/queries/photos';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { captureSetOr404 } from '@/lib/server/api-v1/lookup';
import { AppError } from '@/lib/errors';
import { stageLabel } from '@/lib/server/queue/jobs';
import { requestAnalysis } from '@/lib/server/queue/producer';
import { photoEncoding } from '@/lib/schemas/capture-set';

export const GET = rigRoute(
  'listAnalyses',
  { permission: 'capture.read' },
  async (_req, { actor, params }) => {
    const set = await captureSetOr404(actor.labId, params.captureId);
    const analyses = await listAnalyses(actor.labId, set.id);
    return v1Answer('listAnalyses', 200, { analyses: analyses.map((a) => ({ ...a, stageLabel: stageLabel(a.stage) })) });
  },
);

/** Queues an analysis of the set (or answers the one already waiting for it). */
export const POST = rigRoute(
  'startAnalysis',
  { permission: 'analysis.run' },
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
    return v1Answer('startAnalysis', 202, { analysis: { ...analysis, stageLabel: stageLabel(analysis.stage) }, enqueued, message });
  },
);
