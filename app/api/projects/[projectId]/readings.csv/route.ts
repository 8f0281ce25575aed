import { listExportRows } from '@/db/queries/exports';
import { getProject } from '@/db/queries/projects';
import { withAuth } from '@/lib/server/auth/with-auth';
import { projectAnswer } from '@/lib/server/cache/project-answer';
import { notFound } from '@/lib/errors';
import { csvBytes, csvHeaders, fileSlug, readingsCsv } from '@/lib/server/reports/csv';
import { idOr404 } from '@/lib/reports/http';

export const GET = withAuth<{ projectId: string }>(
  async (req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    return projectAnswer(req, actor, projectId, 'readings.csv', (meta) => csvHeaders(meta.name ?? 'readings'), async () => {
      const project = await getProject(actor.labId, projectId);
      if (!project) throw notFound('No such project');
      const rows = await listExportRows(actor.labId, { projectId: project.id });
      return { body: csvBytes(readingsCsv(rows)), meta: { name: fileSlug(project.name, 'readings') } };
    });
  },
  { permission: 'export.create', projectParam: 'projectId' },
);
