'use client';

import { useActionState } from 'react';
import { resendVerificationAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import type { FormState } from '@/lib/form-state';

export function ResendVerificationForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(() => resendVerificationAction(), {});
  return (
    <form action={action} className="space-y-3">
      {state.message ? (
        <p role={state.ok ? 'status' : 'alert'} className={state.ok ? 'text-sm text-ink' : 'text-sm text-fail'}>
          {state.message}
        </p>
      ) : null}
      <Button type="submit" tone="quiet" className="w-full" disabled={pending}>
        {pending ? 'Sending…' : 'Send a new link'}
      </Button>
    </form>
  );
}
