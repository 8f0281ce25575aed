import { NextResponse } from 'next/server';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { ENGINE_VERSION } from '@/lib/photometry/version';
import { reanalyseSchema } from '@/lib/schemas/capture-set';
import { batchView } from '@/db/queries/reanalyses';
import { startReanalysis } from './reanalyse';

/**
 * Re-analyses with the current engine every capture set of a project (or of one revision,
 * `{ projectId, revisionId }`) whose newest reading an older engine made. 202 with the batch and its
 * progress; 200 with `batch: null` when every reading is already current.
 */
export const POST = withAuth(
  async (req, { actor }) => {
    const scope = reanalyseSchema.parse(await readJson(req));
    const batch = await startReanalysis(actor.labId, actor.user.id, scope);
    if (!batch) return NextResponse.json({ batch: null, message: `Every reading here was made with engine ${ENGINE_VERSION}, the current one: nothing to re-analyse.` });
    return NextResponse.json({ batch: batchView(batch), message: `Re-analysing ${batch.total} capture set${batch.total === 1 ? '' : 's'} with engine ${ENGINE_VERSION}` }, { status: 202 });
  },
  { permission: 'analysis.run' },
);
