import { NextResponse } from 'next/server';
import { z } from 'zod';
import { createCaptureSet } from '@/db/queries/capture-sets';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { captureSetCreateSchema } from '@/lib/schemas/capture-set';
import { uuidSchema } from '@/lib/schemas/common';

export const POST = withAuth(
  async (req, { actor }) => {
    const input = captureSetCreateSchema.extend({ revisionId: uuidSchema }).parse(await readJson(req)) as z.infer<typeof captureSetCreateSchema> & { revisionId: string };
    const set = await createCaptureSet(actor.labId, actor.user.id, input.revisionId, input);
    if (!set) throw notFound('No such revision');
    return NextResponse.json({ captureSet: set }, { status: 201 });
  },
  { permission: 'capture.write' },
);
