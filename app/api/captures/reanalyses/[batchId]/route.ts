import { NextResponse } from 'next/server';
import { batchView, getBatchProgress } from '@/db/queries/reanalyses';
import { can } from '@/lib/auth/permissions';
import { withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { idOr404 } from '../../lookup';
import { queueWaiting } from '../reanalyse';

type P = { batchId: string };

/**
 * A re-analysis batch's progress (n of m done). Sets the lab's queue could not take yet are asked
 * for again here when the caller may run analyses, so the batch moves on while its page is open.
 */
export const GET = withAuth<P>(
  async (_req, { actor, params }) => {
    let batch = await getBatchProgress(actor.labId, idOr404(params.batchId, 're-analysis'));
    if (!batch) throw notFound('No such re-analysis');
    if (batch.waiting > 0 && can(actor.role, 'analysis.run')) batch = await queueWaiting(actor.labId, actor.user.id, batch);
    return NextResponse.json({ batch: batchView(batch) });
  },
  { permission: 'capture.read' },
);
