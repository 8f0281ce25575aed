'use client';

import { signIn } from 'next-auth/react';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useActionState, useEffect, useRef } from 'react';
import { signUpAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/auth/action';

export function SignUpForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(signUpAction, {});
  // React clears the form once the action returns, so the credentials are kept from the submit.
  const typed = useRef({ email: '', password: '' });
  const router = useRouter();

  useEffect(() => {
    if (!state.ok) return;
    void signIn('credentials', { ...typed.current, redirect: false }).then(() => {
      router.replace('/projects');
      router.refresh();
    });
  }, [state, router]);

  const fe = state.fieldErrors ?? {};
  return (
    <form
      action={action}
      onSubmit={(e) => {
        const f = new FormData(e.currentTarget);
        typed.current = { email: String(f.get('email') ?? ''), password: String(f.get('password') ?? '') };
      }}
      className="space-y-4"
      noValidate
    >
      <h1 className="text-lg font-semibold">Start a lab</h1>
      <p className="text-sm text-muted">You become the lab&apos;s admin and can invite your team afterwards.</p>
      {state.message && !state.ok ? (
        <p role="alert" className="text-sm text-fail">
          {state.message}
        </p>
      ) : null}
      <Field label="Your name" name="name" autoComplete="name" defaultValue={state.values?.name} errors={fe.name} required />
      <Field label="E-mail" name="email" type="email" autoComplete="email" defaultValue={state.values?.email} errors={fe.email} required />
      <Field label="Password" name="password" type="password" autoComplete="new-password" errors={fe.password} hint="10 characters or more" required />
      <Field label="Lab name" name="labName" defaultValue={state.values?.labName} errors={fe.labName} placeholder="e.g. Optics bench B" required />
      <Button type="submit" className="w-full" disabled={pending || state.ok}>
        {pending || state.ok ? 'Creating…' : 'Create lab'}
      </Button>
      <p className="text-center text-xs text-muted">
        Already have an account?{' '}
        <Link href="/sign-in" className="text-beam">
          Sign in
        </Link>
      </p>
    </form>
  );
}
