import { withAuth } from '@/lib/server/auth/with-auth';
import { comparisonRows, loadComparison } from '@/lib/server/reports/build';
import { csvResponse, fileSlug, readingsCsv } from '@/lib/server/reports/csv';
import { groupsFrom, idOr404 } from '@/lib/reports/http';

export const GET = withAuth<{ projectId: string }>(
  async (req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    const { a, b } = groupsFrom(req.url);
    const cmp = await loadComparison(actor.labId, projectId, a, b);
    const tagged = await comparisonRows(actor.labId, projectId, cmp.a, cmp.b);
    const groupOf = new Map(tagged.map((t) => [t.row, t.group]));
    return csvResponse(readingsCsv(tagged.map((t) => t.row), (r) => groupOf.get(r) ?? ''), fileSlug(cmp.b.label, 'vs', cmp.a.label, 'readings'));
  },
  { permission: 'export.create' },
);
