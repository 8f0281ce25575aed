import { withAuth } from '@/lib/server/auth/with-auth';
import { revisionReport } from '@/lib/server/reports/build';
import { fileSlug } from '@/lib/server/reports/csv';
import { idOr404 } from '@/lib/reports/http';
import { pdfResponse } from '@/lib/reports/pdf';

export const GET = withAuth<{ revisionId: string }>(
  async (_req, { actor, params }) => {
    const { bytes, name } = await revisionReport(actor.labId, idOr404(params.revisionId, 'revision'), { labName: actor.labName || 'Veilmeter' });
    return pdfResponse(bytes, fileSlug(name));
  },
  { permission: 'export.create' },
);
