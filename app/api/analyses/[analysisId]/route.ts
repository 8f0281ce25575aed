import { NextResponse } from 'next/server';
import { getAnalysis } from '@/db/queries/analyses';
import { getReadingForAnalysis } from '@/db/queries/readings';
import { withAuth } from '@/lib/auth/with-auth';
import { notFound } from '@/lib/errors';
import { stageLabel } from '@/lib/queue/jobs';
import { idOr404 } from '../../captures/lookup';

/** The status a client polls while an analysis runs; the reading's numbers come with it once done. */
export const GET = withAuth<{ analysisId: string }>(
  async (_req, { actor, params }) => {
    const analysis = await getAnalysis(actor.labId, idOr404(params.analysisId, 'analysis'));
    if (!analysis) throw notFound('No such analysis');
    const reading = analysis.status === 'done' ? await getReadingForAnalysis(actor.labId, analysis.id) : null;
    return NextResponse.json({
      analysis: { ...analysis, stageLabel: stageLabel(analysis.stage) },
      reading: reading ? { id: reading.id, ambientContrastRatio: reading.ambientContrastRatio, warningCount: reading.warningCount, result: reading.result } : null,
    });
  },
  { permission: 'capture.read' },
);
