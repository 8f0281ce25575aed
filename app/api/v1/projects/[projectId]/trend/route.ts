import { listTargets } from '@/db/queries/targets';
import { getProjectTrend } from '@/db/queries/trends';
import { conditionalProjectRead, rigRoute, v1Bytes } from '@/lib/server/api-v1/handler';
import { idOr404 } from '@/lib/server/api-v1/lookup';
import { notFound } from '@/lib/errors';
import { toTrendAnswer } from '@/lib/targets/trend-answer';

/** The trend of every metric, or of one with ?metric=; ETag from the project's data version. */
export const GET = rigRoute(
  'getTrend',
  { permission: 'project.read' },
  async (req, { actor, params, query }) => {
    const projectId = idOr404(params.projectId, 'project');
    const metric = query.metric;
    return conditionalProjectRead(req, actor.labId, projectId, metric ? `trend:${metric}` : 'trend', () => ({ 'content-type': 'application/json' }), async () => {
      const trend = await getProjectTrend(actor.labId, projectId);
      if (!trend) throw notFound('No such project');
      const all = await listTargets(actor.labId, projectId);
      const trends = metric ? { [metric]: trend.trends[metric] } : trend.trends;
      const targets = metric ? all.filter((t) => t.metric === metric) : all;
      return { body: v1Bytes('getTrend', 200, toTrendAnswer(trend.revisions, trends, targets)), meta: {} };
    });
  },
);
