import { NextResponse } from 'next/server';
import { batchView, getBatchProgress } from '@/db/queries/reanalyses';
import { withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { idOr404 } from '../../lookup';

type P = { batchId: string };

/**
 * A re-analysis batch's progress (n of m done). Only reads: sets the lab's queue could not take yet
 * are asked for again by the worker's sweeper, whether or not anyone is watching.
 */
export const GET = withAuth<P>(
  async (_req, { actor, params }) => {
    const batch = await getBatchProgress(actor.labId, idOr404(params.batchId, 're-analysis'));
    if (!batch) throw notFound('No such re-analysis');
    return NextResponse.json({ batch: batchView(batch) });
  },
  { permission: 'capture.read' },
);
