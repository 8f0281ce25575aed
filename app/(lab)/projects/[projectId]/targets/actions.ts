'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { createTarget, deleteTarget, updateTarget } from '@/db/queries/targets';
import { formAction } from '@/lib/server/auth/action';
import { AppError, notFound } from '@/lib/errors';
import { uuidSchema } from '@/lib/schemas/common';
import { refineTarget, targetSchema, toTargetWrite } from '@/lib/schemas/target';
import { DEFAULT_TARGETS } from '@/lib/targets/defaults';

function refresh(projectId: string) {
  revalidatePath('/projects');
  revalidatePath(`/projects/${projectId}`, 'layout');
}

export const createTargetAction = formAction('target.write', targetSchema.extend({ projectId: uuidSchema }).superRefine(refineTarget), async (actor, input) => {
  const { projectId, ...rest } = toTargetWrite(input);
  const t = await createTarget(actor.labId, actor.user.id, projectId, rest);
  if (!t) throw notFound('No such project');
  refresh(projectId);
  return 'Target added';
});

export const updateTargetAction = formAction('target.write', targetSchema.extend({ projectId: uuidSchema, id: uuidSchema }).superRefine(refineTarget), async (actor, input) => {
  const { projectId, id, ...rest } = toTargetWrite(input);
  const t = await updateTarget(actor.labId, actor.user.id, projectId, id, rest);
  if (!t) throw notFound('No such target');
  refresh(projectId);
  return 'Target saved';
});

export const deleteTargetAction = formAction('target.write', z.object({ projectId: uuidSchema, id: uuidSchema }), async (actor, input) => {
  const ok = await deleteTarget(actor.labId, actor.user.id, input.projectId, input.id);
  if (!ok) throw notFound('No such target');
  refresh(input.projectId);
  return 'Target removed';
});

export const adoptDefaultTargetAction = formAction('target.write', z.object({ projectId: uuidSchema, defaultId: z.string().max(60) }), async (actor, input) => {
  const d = DEFAULT_TARGETS.find((x) => x.id === input.defaultId);
  if (!d) throw new AppError(422, 'That default does not exist', 'invalid');
  const t = await createTarget(actor.labId, actor.user.id, input.projectId, { metric: d.metric, comparator: d.comparator, value: d.value, conditionNote: d.conditionNote, condition: d.condition ?? {}, variants: [], isDefault: true });
  if (!t) throw notFound('No such project');
  refresh(input.projectId);
  return 'Default added as a target; adjust it to what your team agrees';
});
