import { createCaptureSet } from '@/db/queries/capture-sets';
import { markCaptureSetFromToken } from '@/db/queries/idempotency';
import { rigRoute, v1Answer } from '@/lib/server/api-v1/handler';
import { notFound } from '@/lib/errors';

/** Creates a capture set in a revision of the lab; the token that made it may later delete it. */
export const POST = rigRoute(
  'createCaptureSet',
  { permission: 'capture.write' },
  async (_req, { actor, tokenId, input }) => {
    const { revisionId, ...fields } = input;
    const set = await createCaptureSet(actor.labId, actor.user.id, revisionId, fields);
    if (!set) throw notFound('No such revision');
    if (tokenId) await markCaptureSetFromToken(actor.labId, set.id, tokenId);
    return v1Answer('createCaptureSet', 201, { captureSet: set });
  },
);
