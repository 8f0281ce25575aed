'use client';

import { useActionState } from 'react';
import { createWebhookAction, deleteWebhookAction } from '@/app/(lab)/settings/webhooks/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { FormStatus } from '@/components/ui/form-status';
import type { FormState } from '@/lib/server/auth/action';

export function CreateWebhookForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(createWebhookAction, {});
  return (
    <div className="space-y-3">
      <form action={action} className="flex flex-wrap items-end gap-3" noValidate>
        <Field label="Receiving address" name="url" placeholder="https://rig-hub.example.test/veilmeter" errors={state.fieldErrors?.url} className="min-w-80 flex-1" />
        <fieldset className="flex items-center gap-3 text-sm">
          <legend className="sr-only">Events</legend>
          <label className="flex items-center gap-1">
            <input type="checkbox" name="eventDone" defaultChecked /> analysis.done
          </label>
          <label className="flex items-center gap-1">
            <input type="checkbox" name="eventFailed" defaultChecked /> analysis.failed
          </label>
          <label className="flex items-center gap-1">
            <input type="checkbox" name="eventTarget" defaultChecked /> target.changed
          </label>
        </fieldset>
        <Button type="submit" disabled={pending}>
          Add webhook
        </Button>
      </form>
      {state.fieldErrors?.events ? <p className="text-xs text-fail">{state.fieldErrors.events.join(' ')}</p> : null}
      {state.secret ? (
        <div className="rounded-md border border-glow/50 bg-glow/10 p-3 text-sm">
          <p className="mb-2 text-ink">{state.message}</p>
          <code data-testid="new-webhook-secret" className="block break-all rounded bg-canvas px-2 py-1 font-mono text-xs text-glow">
            {state.secret}
          </code>
        </div>
      ) : (
        <FormStatus small state={state} />
      )}
    </div>
  );
}

export function DeleteWebhookButton({ id }: { id: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(deleteWebhookAction, {});
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="id" value={id} />
      <Button type="submit" tone="danger" disabled={pending}>
        Remove
      </Button>
      <FormStatus small state={state} />
    </form>
  );
}
