import { withAuth } from '@/lib/server/auth/with-auth';
import { captureReport } from '@/lib/server/reports/capture';
import { fileSlug } from '@/lib/server/reports/csv';
import { idOr404 } from '@/lib/reports/http';
import { pdfResponse } from '@/lib/reports/pdf';

export const GET = withAuth<{ captureId: string }>(
  async (_req, { actor, params }) => {
    const { bytes, name } = await captureReport(actor.labId, idOr404(params.captureId, 'capture set'), { labName: actor.labName || 'Veilmeter' });
    return pdfResponse(bytes, fileSlug(name));
  },
  { permission: 'export.create' },
);
