import { listExportRows } from '@/db/queries/exports';
import { getProject } from '@/db/queries/projects';
import { conditionalProjectRead, rigRoute } from '@/lib/server/api-v1/handler';
import { idOr404 } from '@/lib/server/api-v1/lookup';
import { notFound } from '@/lib/errors';
import { csvBytes, csvHeaders, fileSlug, readingsCsv } from '@/lib/server/reports/csv';

/** The project's readings as the app's CSV export; ETag from the project's data version. */
export const GET = rigRoute(
  'readingsCsv',
  { permission: 'export.create' },
  async (req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    return conditionalProjectRead(req, actor.labId, projectId, 'readings.csv', (meta) => csvHeaders(meta.name ?? 'readings'), async () => {
      const project = await getProject(actor.labId, projectId);
      if (!project) throw notFound('No such project');
      const rows = await listExportRows(actor.labId, { projectId: project.id });
      return { body: csvBytes(readingsCsv(rows)), meta: { name: fileSlug(project.name, 'readings') } };
    });
  },
);
