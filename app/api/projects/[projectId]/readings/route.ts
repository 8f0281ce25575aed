import { z } from 'zod';
import { listNewestReadingsPage } from '@/db/queries/trends';
import { withAuth } from '@/lib/server/auth/with-auth';
import { projectAnswer } from '@/lib/server/cache/project-answer';
import { AppError, zodFieldErrors } from '@/lib/errors';
import { idOr404 } from '@/lib/reports/http';

const HEADERS = { 'content-type': 'application/json', 'cache-control': 'private, no-store' };
const MAX_PAGE = 500;

const pageSchema = z.object({
  limit: z.coerce.number({ error: 'limit must be a number' }).int('limit must be a whole number').min(1, 'limit is at least 1').max(MAX_PAGE, `limit is at most ${MAX_PAGE}`).default(50),
  offset: z.coerce.number({ error: 'offset must be a number' }).int('offset must be a whole number').min(0, 'offset cannot be negative').max(10_000_000, 'offset is too large').default(0),
});

/** The readings list of a project, a page at a time: ?limit=1…500 (50) and ?offset=0… */
export const GET = withAuth<{ projectId: string }>(
  async (req, { actor, params }) => {
    const projectId = idOr404(params.projectId, 'project');
    const q = new URL(req.url).searchParams;
    const parsed = pageSchema.safeParse({ limit: q.get('limit') ?? undefined, offset: q.get('offset') ?? undefined });
    if (!parsed.success) throw new AppError(422, 'The page asked for is not valid', 'invalid', zodFieldErrors(parsed.error));
    const page = parsed.data;
    return projectAnswer(req, actor, projectId, `readings:${page.limit}:${page.offset}`, () => HEADERS, async () => {
      const { readings, total } = await listNewestReadingsPage(actor.labId, projectId, page);
      return { body: Buffer.from(JSON.stringify({ readings, total, limit: page.limit, offset: page.offset })), meta: {} };
    });
  },
  { permission: 'project.read', projectParam: 'projectId' },
);
