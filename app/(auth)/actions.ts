'use server';

import { ZodError } from 'zod';
import { hashPassword } from '@/lib/auth/password';
import type { FormState } from '@/lib/auth/action';
import { isUniqueViolation, zodFieldErrors } from '@/lib/errors';
import { signUpSchema } from '@/lib/schemas/user';
import { createUserWithLab } from '@/db/queries/users';
import { recordAudit } from '@/db/queries/audit';

/** Creates a person and their lab (they become its admin); the form then signs them in. */
export async function signUpAction(_prev: FormState, form: FormData): Promise<FormState> {
  try {
    const input = signUpSchema.parse(Object.fromEntries(form.entries()));
    const { userId, labId } = await createUserWithLab({ email: input.email, name: input.name, labName: input.labName, passwordHash: await hashPassword(input.password) });
    await recordAudit({ labId, userId, action: 'lab.create', targetType: 'lab', targetId: labId });
    return { ok: true };
  } catch (err) {
    if (err instanceof ZodError) return { ok: false, message: 'Check the highlighted fields', fieldErrors: zodFieldErrors(err) };
    if (isUniqueViolation(err)) return { ok: false, fieldErrors: { email: ['An account with this e-mail already exists. Sign in instead.'] } };
    console.error('[veilmeter] sign-up failed', err);
    return { ok: false, message: 'We could not create the account. Try again.' };
  }
}
