import { getAnalysisForPoll } from '@/db/queries/readings';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { idOr404 } from '@/lib/server/api-v1/lookup';
import { notFound } from '@/lib/errors';
import { stageLabel } from '@/lib/server/queue/jobs';

/** The status a rig polls while an analysis runs; the reading comes with it once done. */
export const GET = rigRoute(
  'getAnalysis',
  { permission: 'capture.read' },
  async (_req, { actor, params }) => {
    const found = await getAnalysisForPoll(actor.labId, idOr404(params.analysisId, 'analysis'));
    if (!found) throw notFound('No such analysis');
    const { analysis, reading } = found;
    return v1Answer('getAnalysis', 200, { analysis: { ...analysis, stageLabel: stageLabel(analysis.stage) }, reading });
  },
);
