import { listExportRows } from '@/db/queries/exports';
import { getProject } from '@/db/queries/projects';
import { withAuth } from '@/lib/auth/with-auth';
import { notFound } from '@/lib/errors';
import { csvResponse, fileSlug, readingsCsv } from '@/lib/reports/csv';
import { idOr404 } from '@/lib/reports/http';

export const GET = withAuth<{ projectId: string }>(
  async (_req, { actor, params }) => {
    const project = await getProject(actor.labId, idOr404(params.projectId, 'project'));
    if (!project) throw notFound('No such project');
    const rows = await listExportRows(actor.labId, { projectId: project.id });
    return csvResponse(readingsCsv(rows), fileSlug(project.name, 'readings'));
  },
  { permission: 'export.create' },
);
