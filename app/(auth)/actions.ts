'use server';

import { ZodError } from 'zod';
import { acceptInvitation, findOpenInvitation } from '@/db/queries/invitations';
import { getUserByEmail } from '@/db/queries/users';
import { hashPassword, verifyPassword } from '@/lib/auth/password';
import { AppError } from '@/lib/errors';
import { invitationAcceptSchema, newAccountSchema } from '@/lib/schemas/team';
import { echoValues, isFormData, type FormState } from '@/lib/auth/action';
import { isUniqueViolation, zodFieldErrors } from '@/lib/errors';
import { signUpSchema } from '@/lib/schemas/user';
import { createUserWithLab } from '@/db/queries/users';
import { recordAudit } from '@/db/queries/audit';

/** Creates a person and their lab (they become its admin); the form then signs them in. */
export async function signUpAction(prevOrForm: FormState | FormData, maybeForm?: FormData): Promise<FormState> {
  const form = maybeForm ?? (isFormData(prevOrForm) ? prevOrForm : new FormData());
  try {
    const input = signUpSchema.parse(Object.fromEntries(form.entries()));
    const { userId, labId } = await createUserWithLab({ email: input.email, name: input.name, labName: input.labName, passwordHash: await hashPassword(input.password) });
    await recordAudit({ labId, userId, action: 'lab.create', targetType: 'lab', targetId: labId });
    return { ok: true };
  } catch (err) {
    if (err instanceof ZodError) return { ok: false, message: 'Check the highlighted fields', fieldErrors: zodFieldErrors(err), values: echoValues(form) };
    if (isUniqueViolation(err)) return { ok: false, fieldErrors: { email: ['An account with this e-mail already exists. Sign in instead.'] }, values: echoValues(form) };
    console.error('[veilmeter] sign-up failed', err);
    return { ok: false, message: 'We could not create the account. Try again.' };
  }
}

/** Accepts an invitation: signs into the existing account's password, or creates the account. */
export async function acceptInvitationAction(prevOrForm: FormState | FormData, maybeForm?: FormData): Promise<FormState> {
  const form = maybeForm ?? (isFormData(prevOrForm) ? prevOrForm : new FormData());
  try {
    const input = invitationAcceptSchema.parse(Object.fromEntries(form.entries()));
    const inv = await findOpenInvitation(input.token);
    if (!inv) return { ok: false, message: 'This invitation has been used, withdrawn or has expired. Ask your lab admin for a new one.' };
    let account: { name: string; password: string } | null = null;
    if (!inv.accountExists) account = newAccountSchema.parse({ name: input.name ?? '', password: input.password ?? '' });
    const passwordHash = account ? await hashPassword(account.password) : '';
    const done = await acceptInvitation(input.token, async (trx, open) => {
      if (account) {
        const [u] = await trx('users').insert({ email: open.email, name: account.name, password_hash: passwordHash }).returning<{ id: string }[]>('id');
        if (!u) throw new Error('user insert failed');
        return u.id;
      }
      const user = await getUserByEmail(open.email);
      if (!user || !(await verifyPassword(input.password ?? '', user.passwordHash))) throw new AppError(401, 'That password does not match the account of this address', 'bad_password', { password: ['Wrong password for this account'] });
      return user.id;
    });
    if (!done) return { ok: false, message: 'This invitation has been used, withdrawn or has expired. Ask your lab admin for a new one.' };
    // No cookie is set here: that would re-render this page (now a spent link) before the form
    // can sign the person in. A person with several labs picks the new one in the lab switcher.
    return { ok: true, message: inv.email };
  } catch (err) {
    if (err instanceof ZodError) return { ok: false, message: 'Check the highlighted fields', fieldErrors: zodFieldErrors(err), values: echoValues(form) };
    if (err instanceof AppError) return { ok: false, message: err.message, fieldErrors: err.fieldErrors, values: echoValues(form) };
    console.error('[veilmeter] invitation acceptance failed', err);
    return { ok: false, message: 'We could not accept the invitation. Try again.' };
  }
}
