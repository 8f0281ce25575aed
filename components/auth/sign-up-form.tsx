'use client';

import Link from 'next/link';
import { useActionState } from 'react';
import { signUpAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/form-state';

export function SignUpForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(signUpAction, {});
  // The answer is the same whether or not the address has an account: the mail tells the rest.
  if (state.ok) {
    return (
      <div className="space-y-3">
        <h1 className="text-lg font-semibold">Check your inbox</h1>
        <p role="status" className="text-sm text-muted">
          {state.message} We wrote to <strong className="text-ink">{state.values?.email}</strong>.
        </p>
        <Link href="/sign-in" className="text-sm text-beam">
          Sign in
        </Link>
      </div>
    );
  }

  const fe = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-4" noValidate>
      <h1 className="text-lg font-semibold">Start a lab</h1>
      <p className="text-sm text-muted">You become the lab&apos;s admin and can invite your team afterwards.</p>
      {state.message && !state.ok ? (
        <p role="alert" className="text-sm text-fail">
          {state.message}
        </p>
      ) : null}
      <Field label="Your name" name="name" autoComplete="name" defaultValue={state.values?.name} errors={fe.name} required />
      <Field label="E-mail" name="email" type="email" autoComplete="email" defaultValue={state.values?.email} errors={fe.email} required />
      <Field label="Password" name="password" type="password" autoComplete="new-password" errors={fe.password} hint="10 characters or more, not a common one" required />
      <Field label="Lab name" name="labName" defaultValue={state.values?.labName} errors={fe.labName} placeholder="e.g. Optics bench B" required />
      <Button type="submit" className="w-full" disabled={pending}>
        {pending ? 'Creating…' : 'Create lab'}
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
