'use server';

import { ZodError } from 'zod';
import { acceptInvitation, findOpenInvitation } from '@/db/queries/invitations';
import { getUserByEmail, markEmailVerified } from '@/db/queries/users';
import { sendVerification, SIGN_UP_ANSWER, signUp } from '@/lib/server/auth/accounts';
import { echoValues, isFormData, type FormState } from '@/lib/server/auth/action';
import { spend } from '@/lib/server/auth/limits';
import { hashPassword, verifyPassword } from '@/lib/auth/password';
import { passwordProblems } from '@/lib/auth/password-rules';
import { actionClientAddress } from '@/lib/server/auth/request-client';
import { getUnverifiedUser } from '@/lib/server/auth/session';
import { AppError, zodFieldErrors } from '@/lib/errors';
import { RateLimited } from '@/lib/server/security/rate-limit';
import { hashSecret } from '@/lib/security/tokens';
import { invitationAcceptSchema, newAccountSchema } from '@/lib/schemas/team';
import { signUpSchema } from '@/lib/schemas/user';

/**
 * Starts a lab (its creator becomes its admin) once the address is confirmed. The answer is the
 * same whether or not the address has an account (lib/server/auth/accounts.ts); the person signs in
 * after opening the link in the mail.
 */
export async function signUpAction(prevOrForm: FormState | FormData, maybeForm?: FormData): Promise<FormState> {
  const form = maybeForm ?? (isFormData(prevOrForm) ? prevOrForm : new FormData());
  try {
    const input = signUpSchema.parse(Object.fromEntries(form.entries()));
    await signUp(input, await actionClientAddress());
    return { ok: true, message: SIGN_UP_ANSWER, values: { email: input.email } };
  } catch (err) {
    if (err instanceof ZodError) return { ok: false, message: 'Check the highlighted fields', fieldErrors: zodFieldErrors(err), values: echoValues(form) };
    if (err instanceof RateLimited) return { ok: false, message: 'Too many sign-ups from here. Wait an hour and try again.', values: echoValues(form) };
    console.error('[veilmeter] sign-up failed', err);
    return { ok: false, message: 'We could not create the account. Try again.' };
  }
}

/** Sends a new verification link to the signed-in person whose address is not confirmed yet. */
export async function resendVerificationAction(): Promise<FormState> {
  try {
    const user = await getUnverifiedUser();
    if (!user) return { ok: false, message: 'Sign in with the account whose address you want to confirm. A confirmed address needs nothing more.' };
    await spend([['verifyResend', user.id]]);
    await sendVerification(user);
    return { ok: true, message: `A new link is on its way to ${user.email}. Earlier links no longer work.` };
  } catch (err) {
    if (err instanceof RateLimited) return { ok: false, message: 'Three links an hour at most. Wait, and look in your spam folder meanwhile.' };
    console.error('[veilmeter] verification resend failed', err);
    return { ok: false, message: 'We could not send the link. Try again.' };
  }
}

/**
 * Accepts an invitation: signs into the existing account's password, or creates the account. The
 * link came by mail, so opening it proves the address: a new account starts verified, and an
 * existing one is marked so. Password checks are limited per client and per invitation.
 */
export async function acceptInvitationAction(prevOrForm: FormState | FormData, maybeForm?: FormData): Promise<FormState> {
  const form = maybeForm ?? (isFormData(prevOrForm) ? prevOrForm : new FormData());
  try {
    const input = invitationAcceptSchema.parse(Object.fromEntries(form.entries()));
    const inv = await findOpenInvitation(input.token);
    if (!inv) return { ok: false, message: 'This invitation has been used, withdrawn or has expired. Ask your lab admin for a new one.' };
    let account: { name: string; password: string } | null = null;
    if (!inv.accountExists) {
      account = newAccountSchema.parse({ name: input.name ?? '', password: input.password ?? '' });
      const [problem] = passwordProblems(account.password, { email: inv.email, name: account.name });
      if (problem) return { ok: false, message: 'Check the highlighted fields', fieldErrors: { password: [problem] }, values: echoValues(form) };
    } else {
      await spend([
        ['inviteClient', await actionClientAddress()],
        ['inviteToken', hashSecret(input.token)],
      ]);
    }
    const passwordHash = account ? await hashPassword(account.password) : '';
    const done = await acceptInvitation(input.token, async (trx, open) => {
      if (account) {
        const [u] = await trx('users').insert({ email: open.email, name: account.name, password_hash: passwordHash, email_verified_at: trx.fn.now() }).returning<{ id: string }[]>('id');
        if (!u) throw new Error('user insert failed');
        return u.id;
      }
      const user = await getUserByEmail(open.email);
      if (!user || !(await verifyPassword(input.password ?? '', user.passwordHash))) throw new AppError(401, 'That password does not match the account of this address', 'bad_password', { password: ['Wrong password for this account'] });
      await markEmailVerified(user.id, trx);
      return user.id;
    });
    if (!done) return { ok: false, message: 'This invitation has been used, withdrawn or has expired. Ask your lab admin for a new one.' };
    // No cookie is set here: that would re-render this page (now a spent link) before the form
    // can sign the person in. A person with several labs picks the new one in the lab switcher.
    return { ok: true, message: inv.email };
  } catch (err) {
    if (err instanceof ZodError) return { ok: false, message: 'Check the highlighted fields', fieldErrors: zodFieldErrors(err), values: echoValues(form) };
    if (err instanceof RateLimited) return { ok: false, message: 'Too many password attempts. Wait 15 minutes and try again.', values: echoValues(form) };
    if (err instanceof AppError) return { ok: false, message: err.message, fieldErrors: err.fieldErrors, values: echoValues(form) };
    console.error('[veilmeter] invitation acceptance failed', err);
    return { ok: false, message: 'We could not accept the invitation. Try again.' };
  }
}
