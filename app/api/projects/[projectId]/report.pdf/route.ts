import { withAuth } from '@/lib/server/auth/with-auth';
import { projectReport } from '@/lib/server/reports/build';
import { fileSlug } from '@/lib/server/reports/csv';
import { idOr404 } from '@/lib/reports/http';
import { pdfResponse } from '@/lib/reports/pdf';

export const GET = withAuth<{ projectId: string }>(
  async (_req, { actor, params }) => {
    const { bytes, name } = await projectReport(actor.labId, idOr404(params.projectId, 'project'), { labName: actor.labName || 'Veilmeter' });
    return pdfResponse(bytes, fileSlug(name));
  },
  { permission: 'export.create' },
);
