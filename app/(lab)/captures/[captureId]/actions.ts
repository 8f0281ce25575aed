'use server';

import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { z } from 'zod';
import { deleteCaptureSet, getCaptureSet, updateCaptureSet } from '@/db/queries/capture-sets';
import { formAction } from '@/lib/server/auth/action';
import { notFound } from '@/lib/errors';
import { captureSetSchema } from '@/lib/schemas/capture-set';
import { uuidSchema } from '@/lib/schemas/common';
import { deleteKeys } from '@/lib/server/storage';

export const updateCaptureSetAction = formAction('capture.write', captureSetSchema.extend({ id: uuidSchema }), async (actor, input) => {
  const { id, ...fields } = input;
  // the form sends every field: a measurement left blank is cleared, not kept
  const set = await updateCaptureSet(actor.labId, actor.user.id, id, { ...fields, ambientLux: fields.ambientLux, backgroundCdm2: fields.backgroundCdm2 });
  if (!set) throw notFound('No such capture set');
  revalidatePath(`/captures/${id}`);
  revalidatePath(`/projects/${set.projectId}/revisions/${set.revisionId}`);
  return 'Saved';
});

export const deleteCaptureSetAction = formAction('capture.delete', z.object({ id: uuidSchema }), async (actor, input) => {
  const set = await getCaptureSet(actor.labId, input.id);
  if (!set) throw notFound('No such capture set');
  const keys = await deleteCaptureSet(actor.labId, actor.user.id, input.id);
  if (!keys) throw notFound('No such capture set');
  await deleteKeys(keys);
  const revisionPath = `/projects/${set.projectId}/revisions/${set.revisionId}`;
  revalidatePath(revisionPath);
  redirect(revisionPath);
});
