import { getReadingForAnalysis } from '@/db/queries/readings';
import { withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { getStorage } from '@/lib/server/storage';
import { idOr404 } from '../../../../captures/lookup';

export const GET = withAuth<{ analysisId: string; name: string }>(
  async (_req, { actor, params }) => {
    const reading = await getReadingForAnalysis(actor.labId, idOr404(params.analysisId, 'analysis'));
    if (!reading) throw notFound('No reading for this analysis');
    const key = params.name === 'log-contrast.png' ? reading.artifacts.logContrastKey : params.name === 'difference.png' ? reading.artifacts.differenceKey : undefined;
    const bytes = key ? await getStorage().get(key) : null;
    if (!bytes) throw notFound('No such artifact');
    return new Response(new Uint8Array(bytes), { headers: { 'content-type': 'image/png', 'cache-control': 'private, max-age=86400, immutable', 'x-content-type-options': 'nosniff' } });
  },
  { permission: 'capture.read' },
);
