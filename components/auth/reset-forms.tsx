'use client';

import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';

type Answer = { message?: string; error?: { message: string; fieldErrors?: Record<string, string[]> } };

async function post(url: string, body: unknown): Promise<{ status: number; data: Answer }> {
  const res = await fetch(url, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: res.status, data: (await res.json().catch(() => ({}))) as Answer };
}

export function ResetRequestForm() {
  const [answer, setAnswer] = useState<Answer>({});
  const [busy, setBusy] = useState(false);
  return (
    <form
      noValidate
      className="space-y-4"
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        const { data } = await post('/api/password-reset', { email: String(new FormData(e.currentTarget).get('email') ?? '') });
        setAnswer(data);
        setBusy(false);
      }}
    >
      <h1 className="text-lg font-semibold">Reset your password</h1>
      <p className="text-sm text-muted">Enter the address you sign in with. We send a link that works once, for one hour.</p>
      {answer.message ? <p role="status" className="rounded-md border border-pass/40 bg-pass/10 px-3 py-2 text-sm text-ink">{answer.message}</p> : null}
      {answer.error && !answer.error.fieldErrors ? <p role="alert" className="text-sm text-fail">{answer.error.message}</p> : null}
      <Field label="E-mail" name="email" type="email" autoComplete="email" errors={answer.error?.fieldErrors?.email} />
      <Button type="submit" className="w-full" disabled={busy}>
        {busy ? 'Sending…' : 'Send reset link'}
      </Button>
      <p className="text-center text-xs text-muted">
        <Link href="/sign-in" className="text-beam">
          Back to sign-in
        </Link>
      </p>
    </form>
  );
}

export function ResetCompleteForm({ token }: { token: string }) {
  const [answer, setAnswer] = useState<Answer>({});
  const [done, setDone] = useState(false);
  const [busy, setBusy] = useState(false);
  if (done) {
    return (
      <div className="space-y-3">
        <h1 className="text-lg font-semibold">Password changed</h1>
        <p role="status" className="text-sm text-muted">{answer.message}</p>
        <Link href="/sign-in" className="text-sm text-beam">
          Sign in
        </Link>
      </div>
    );
  }
  const fe = answer.error?.fieldErrors ?? {};
  return (
    <form
      noValidate
      className="space-y-4"
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        const f = new FormData(e.currentTarget);
        const { status, data } = await post('/api/password-reset/complete', { token, password: String(f.get('password') ?? ''), confirm: String(f.get('confirm') ?? '') });
        setAnswer(data);
        setDone(status === 200);
        setBusy(false);
      }}
    >
      <h1 className="text-lg font-semibold">Choose a new password</h1>
      {answer.error && !answer.error.fieldErrors ? <p role="alert" className="text-sm text-fail">{answer.error.message}</p> : null}
      <Field label="New password" name="password" type="password" autoComplete="new-password" hint="10 characters or more, not a common one" errors={fe.password} />
      <Field label="Repeat it" name="confirm" type="password" autoComplete="new-password" errors={fe.confirm} />
      <Button type="submit" className="w-full" disabled={busy}>
        {busy ? 'Saving…' : 'Set password'}
      </Button>
    </form>
  );
}
