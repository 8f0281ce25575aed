'use client';

import { signIn } from 'next-auth/react';
import { useRouter } from 'next/navigation';
import { useActionState, useEffect, useRef } from 'react';
import { acceptInvitationAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/form-state';

export function AcceptInvitationForm({ token, email, accountExists }: { token: string; email: string; accountExists: boolean }) {
  const [state, action, pending] = useActionState<FormState, FormData>(acceptInvitationAction, {});
  // React clears the form once the action returns, so the password is kept from the submit.
  const typed = useRef('');
  const router = useRouter();
  useEffect(() => {
    if (!state.ok) return;
    void signIn('credentials', { email, password: typed.current, redirect: false }).then(() => {
      router.replace('/projects');
      router.refresh();
    });
  }, [state, email, router]);
  const fe = state.fieldErrors ?? {};
  return (
    <form action={action} onSubmit={(e) => (typed.current = String(new FormData(e.currentTarget).get('password') ?? ''))} className="space-y-4" noValidate>
      <input type="hidden" name="token" value={token} />
      {state.message && !state.ok ? (
        <p role="alert" className="text-sm text-fail">
          {state.message}
        </p>
      ) : null}
      <Field label="E-mail" name="email-shown" value={email} readOnly />
      {accountExists ? (
        <Field label="Your password" name="password" type="password" autoComplete="current-password" errors={fe.password} hint="You already have an account: confirm it's you." />
      ) : (
        <>
          <Field label="Your name" name="name" autoComplete="name" defaultValue={state.values?.name} errors={fe.name} />
          <Field label="Choose a password" name="password" type="password" autoComplete="new-password" hint="10 characters or more, not a common one" errors={fe.password} />
        </>
      )}
      <Button type="submit" className="w-full" disabled={pending || state.ok}>
        {pending || state.ok ? 'Joining…' : 'Join the lab'}
      </Button>
    </form>
  );
}
