import { NextResponse } from 'next/server';
import { listTargets } from '@/db/queries/targets';
import { getProjectDataVersion, getProjectTrend } from '@/db/queries/trends';
import { withAuth } from '@/lib/auth/with-auth';
import { cachedBody } from '@/lib/cache/read-cache';
import { notFound } from '@/lib/errors';
import { idOr404 } from '@/lib/reports/http';

const HEADERS = { 'content-type': 'application/json', 'cache-control': 'private, no-store' };

export const GET = withAuth<{ projectId: string }>(
  async (_req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    // the fingerprint is read before the data, so a cached body is never older than its key
    const version = await getProjectDataVersion(actor.labId, projectId);
    if (!version) throw notFound('No such project');
    const { body } = await cachedBody('trend', actor.labId, projectId, version, async () => {
      const trend = await getProjectTrend(actor.labId, projectId);
      if (!trend) throw notFound('No such project');
      const targets = await listTargets(actor.labId, projectId);
      return { body: Buffer.from(JSON.stringify({ revisions: trend.revisions, trends: trend.trends, targets })), meta: {} };
    });
    return new NextResponse(body, { headers: HEADERS });
  },
  { permission: 'project.read' },
);
