import { NextResponse } from 'next/server';
import { listTargets } from '@/db/queries/targets';
import { getProjectTrend } from '@/db/queries/trends';
import { withAuth } from '@/lib/auth/with-auth';
import { notFound } from '@/lib/errors';
import { idOr404 } from '@/lib/reports/http';

export const GET = withAuth<{ projectId: string }>(
  async (_req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    const trend = await getProjectTrend(actor.labId, projectId);
    if (!trend) throw notFound('No such project');
    const targets = await listTargets(actor.labId, projectId);
    return NextResponse.json({ revisions: trend.revisions, trends: trend.trends, targets }, { headers: { 'cache-control': 'private, no-store' } });
  },
  { permission: 'project.read' },
);
