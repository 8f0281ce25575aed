import { withAuth } from '@/lib/server/auth/with-auth';
import { comparisonReport } from '@/lib/server/reports/build';
import { fileSlug } from '@/lib/server/reports/csv';
import { groupsFrom, idOr404 } from '@/lib/reports/http';
import { pdfResponse } from '@/lib/reports/pdf';

export const GET = withAuth<{ projectId: string }>(
  async (req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    const { a, b } = groupsFrom(req.url);
    const { bytes, name } = await comparisonReport(actor.labId, projectId, a, b, { labName: actor.labName || 'Veilmeter' });
    return pdfResponse(bytes, fileSlug(name));
  },
  { permission: 'export.create' },
);
