import { NextResponse } from 'next/server';
import { getAnalysisForPoll } from '@/db/queries/readings';
import { withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { stageLabel } from '@/lib/server/queue/jobs';
import { idOr404 } from '../../captures/lookup';

/** The status a client polls while an analysis runs; the reading's numbers come with it once done. */
export const GET = withAuth<{ analysisId: string }>(
  async (_req, { actor, params }) => {
    const found = await getAnalysisForPoll(actor.labId, idOr404(params.analysisId, 'analysis'));
    if (!found) throw notFound('No such analysis');
    const { analysis, reading } = found;
    return NextResponse.json({
      analysis: { ...analysis, stageLabel: stageLabel(analysis.stage) },
      reading: reading ? { id: reading.id, ambientContrastRatio: reading.ambientContrastRatio, warningCount: reading.warningCount, result: reading.result } : null,
    });
  },
  { permission: 'capture.read' },
);
