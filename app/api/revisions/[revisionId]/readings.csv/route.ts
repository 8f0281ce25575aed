import { listExportRows } from '@/db/queries/exports';
import { getRevision } from '@/db/queries/revision-edits';
import { withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { csvResponse, fileSlug, readingsCsv } from '@/lib/server/reports/csv';
import { idOr404 } from '@/lib/reports/http';

export const GET = withAuth<{ revisionId: string }>(
  async (_req, { actor, params }) => {
    const revision = await getRevision(actor.labId, idOr404(params.revisionId, 'revision'));
    if (!revision) throw notFound('No such revision');
    const rows = await listExportRows(actor.labId, { projectId: revision.projectId, revisionId: revision.id });
    return csvResponse(readingsCsv(rows), fileSlug(revision.projectName, revision.label, 'readings'));
  },
  { permission: 'export.create' },
);
