'use server';

import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { createCaptureSet } from '@/db/queries/capture-sets';
import { createRevision, updateRevision } from '@/db/queries/revision-edits';
import { formAction } from '@/lib/server/auth/action';
import { notFound } from '@/lib/errors';
import { captureSetCreateSchema } from '@/lib/schemas/capture-set';
import { uuidSchema } from '@/lib/schemas/common';
import { revisionCreateSchema, revisionUpdateSchema } from '@/lib/schemas/revision';

export const createRevisionAction = formAction('revision.write', revisionCreateSchema.extend({ projectId: uuidSchema }), async (actor, input) => {
  const revision = await createRevision(actor.labId, actor.user.id, input.projectId, { ...input, builtOn: input.builtOn ?? null });
  if (!revision) throw notFound('No such project');
  revalidatePath(`/projects/${input.projectId}`);
  return `Added revision “${revision.label}”`;
});

export const updateRevisionAction = formAction('revision.write', revisionUpdateSchema.extend({ id: uuidSchema }), async (actor, input) => {
  const { id, ...patch } = input;
  const revision = await updateRevision(actor.labId, actor.user.id, id, { ...patch, builtOn: patch.builtOn ?? null });
  if (!revision) throw notFound('No such revision');
  revalidatePath(`/projects/${revision.projectId}`);
  revalidatePath(`/projects/${revision.projectId}/revisions/${id}`);
  return 'Saved';
});

export const createCaptureSetAction = formAction('capture.write', captureSetCreateSchema.extend({ revisionId: uuidSchema }), async (actor, input) => {
  const set = await createCaptureSet(actor.labId, actor.user.id, input.revisionId, input);
  if (!set) throw notFound('No such revision');
  revalidatePath(`/projects/${set.projectId}/revisions/${set.revisionId}`);
  redirect(`/captures/${set.id}`);
});
