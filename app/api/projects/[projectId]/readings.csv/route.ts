import { listExportRows } from '@/db/queries/exports';
import { getProject } from '@/db/queries/projects';
import { getProjectDataVersion } from '@/db/queries/trends';
import { withAuth } from '@/lib/auth/with-auth';
import { cachedAnswer, cachedBody } from '@/lib/cache/read-cache';
import { notFound } from '@/lib/errors';
import { csvBytes, csvHeaders, fileSlug, readingsCsv } from '@/lib/reports/csv';
import { idOr404 } from '@/lib/reports/http';

export const GET = withAuth<{ projectId: string }>(
  async (req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    // the fingerprint is read before the data, so a cached body is never older than its key
    const version = await getProjectDataVersion(actor.labId, projectId);
    if (!version) throw notFound('No such project');
    const cached = await cachedBody('readings.csv', actor.labId, projectId, version, async () => {
      const project = await getProject(actor.labId, projectId);
      if (!project) throw notFound('No such project');
      const rows = await listExportRows(actor.labId, { projectId: project.id });
      return { body: csvBytes(readingsCsv(rows)), meta: { name: fileSlug(project.name, 'readings') } };
    });
    return cachedAnswer(req, cached, csvHeaders(cached.meta.name ?? 'readings'));
  },
  { permission: 'export.create' },
);
