import { listTargets } from '@/db/queries/targets';
import { getProjectTrend } from '@/db/queries/trends';
import { withAuth } from '@/lib/server/auth/with-auth';
import { projectAnswer } from '@/lib/server/cache/project-answer';
import { AppError, notFound } from '@/lib/errors';
import { idOr404 } from '@/lib/reports/http';
import { trendMetricSchema } from '@/lib/schemas/target';
import { toTrendAnswer } from '@/lib/targets/trend-answer';

const HEADERS = { 'content-type': 'application/json', 'cache-control': 'private, no-store' };

/**
 * The trend of every metric, or of one with ?metric=<key> (what one chart needs), in the compact
 * shape of lib/targets/trend-answer.ts: each capture set named once, points as [set, value].
 */
export const GET = withAuth<{ projectId: string }>(
  async (req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    const asked = new URL(req.url).searchParams.get('metric');
    const parsed = trendMetricSchema.safeParse(asked);
    if (!parsed.success) {
      throw new AppError(422, `Unknown metric "${(asked ?? '').slice(0, 60)}"`, 'invalid', { metric: parsed.error.issues.map((i) => i.message) });
    }
    const metric = parsed.data;
    return projectAnswer(req, actor, projectId, metric ? `trend:${metric}` : 'trend', () => HEADERS, async () => {
      const trend = await getProjectTrend(actor.labId, projectId);
      if (!trend) throw notFound('No such project');
      const all = await listTargets(actor.labId, projectId);
      const trends = metric ? { [metric]: trend.trends[metric] } : trend.trends;
      const targets = metric ? all.filter((t) => t.metric === metric) : all;
      return { body: Buffer.from(JSON.stringify(toTrendAnswer(trend.revisions, trends, targets))), meta: {} };
    });
  },
  { permission: 'project.read', projectParam: 'projectId' },
);
