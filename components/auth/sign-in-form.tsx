'use client';

import { signIn } from 'next-auth/react';
import Link from 'next/link';
import { useRouter, useSearchParams } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { sameOriginPath } from '@/lib/auth/safe-next';

export function SignInForm() {
  const router = useRouter();
  const params = useSearchParams();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    setBusy(true);
    setError(null);
    const res = await signIn('credentials', { email: String(form.get('email') ?? ''), password: String(form.get('password') ?? ''), redirect: false });
    setBusy(false);
    if (!res || res.error) {
      setError(res?.status === 429 ? 'Too many attempts. Wait a minute and try again.' : 'That e-mail and password do not match an account.');
      return;
    }
    // only a path on this origin, resolved as the browser would resolve it (`/\evil.example` is another host)
    router.replace(sameOriginPath(params.get('next'), window.location.origin) ?? '/projects');
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate>
      <h1 className="text-lg font-semibold">Sign in</h1>
      {error ? (
        <p role="alert" className="rounded-md border border-fail/50 bg-fail/10 px-3 py-2 text-sm text-fail">
          {error}
        </p>
      ) : null}
      <Field label="E-mail" name="email" type="email" autoComplete="email" required />
      <Field label="Password" name="password" type="password" autoComplete="current-password" required />
      <Button type="submit" className="w-full" disabled={busy}>
        {busy ? 'Signing in…' : 'Sign in'}
      </Button>
      <div className="flex justify-between text-xs text-muted">
        <Link href="/sign-up" className="hover:text-beam">
          Start a lab
        </Link>
        <Link href="/reset" className="hover:text-beam">
          Forgot password?
        </Link>
      </div>
    </form>
  );
}
