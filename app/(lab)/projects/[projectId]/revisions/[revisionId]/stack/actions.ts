'use server';

import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { getRevisionStack, saveRevisionStack } from '@/db/queries/stacks';
import { formAction } from '@/lib/server/auth/action';
import { AppError, notFound, zodFieldErrors } from '@/lib/errors';
import { uuidSchema } from '@/lib/schemas/common';
import { stackSchema, variantStacksSchema, type VariantStacks } from '@/lib/schemas/stack';
import { variantStack } from '@/components/stack/workbench-model';

const saveStackInput = z.object({
  projectId: uuidSchema,
  revisionId: uuidSchema,
  // The stack travels as JSON text in one form field; 32 elements fit easily in this.
  stack: z.string().max(100_000, { message: 'The stack is too large' }),
  // each variant's change to the stack, as JSON; absent leaves the stored variants as they are
  variantStacks: z.string().max(200_000, { message: 'The variants are too large' }).optional(),
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
  let variants: VariantStacks | undefined;
  if (input.variantStacks !== undefined) {
    let rawVariants: unknown;
    try {
      rawVariants = JSON.parse(input.variantStacks);
    } catch {
      throw new AppError(422, 'The variants could not be read; reload the page and try again', 'invalid_json');
    }
    const pv = variantStacksSchema.safeParse(rawVariants);
    if (!pv.success) throw new AppError(422, `A variant’s parts are not valid: ${pv.error.issues[0]?.message ?? 'check them'}`, 'invalid');
    // each variant's stack must itself be a stack the planner can model
    for (const [name, change] of Object.entries(pv.data)) {
      const v = variantStack(parsed.data, change);
      if (!v.stack) throw new AppError(422, `The stack of “${name}” is not valid: ${v.error}`, 'invalid');
    }
    variants = pv.data;
  }
  const saved = await saveRevisionStack(actor.labId, actor.user.id, revision.revisionId, parsed.data, variants);
  if (!saved) throw notFound('No such revision');
  revalidatePath(`/projects/${input.projectId}/revisions/${input.revisionId}/stack`);
  return `Stack of ${saved.label} saved`;
});
