'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { getRevisionStack, saveRevisionStack } from '@/db/queries/stacks';
import { formAction } from '@/lib/auth/action';
import { AppError, notFound, zodFieldErrors } from '@/lib/errors';
import { uuidSchema } from '@/lib/schemas/common';
import { stackSchema } from '@/lib/schemas/stack';

const saveStackInput = z.object({
  projectId: uuidSchema,
  revisionId: uuidSchema,
  // The stack travels as JSON text in one form field; 32 elements fit easily in this.
  stack: z.string().max(100_000, { message: 'The stack is too large' }),
});

/** Stores a revision's stack after checking it with the same schema the editor uses. */
export const saveStackAction = formAction('stack.write', saveStackInput, async (actor, input) => {
  const revision = await getRevisionStack(actor.labId, input.projectId, input.revisionId);
  if (!revision) throw notFound('No such revision');
  let raw: unknown;
  try {
    raw = JSON.parse(input.stack);
  } catch {
    throw new AppError(422, 'The stack could not be read; reload the page and try again', 'invalid_json');
  }
  const parsed = stackSchema.safeParse(raw);
  if (!parsed.success) throw new AppError(422, 'Check the highlighted fields', 'invalid', zodFieldErrors(parsed.error));
  const saved = await saveRevisionStack(actor.labId, actor.user.id, revision.revisionId, parsed.data);
  if (!saved) throw notFound('No such revision');
  revalidatePath(`/projects/${input.projectId}/revisions/${input.revisionId}/stack`);
  return `Stack of ${saved.label} saved`;
});
