'use client';

import { useActionState } from 'react';
import { createWebhookAction, deleteWebhookAction } from '@/app/(lab)/settings/webhooks/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/form-state';
import { CheckRow, OneTimeSecret, RowActionButton, type CheckOption } from './one-time-secret';

const EVENTS: CheckOption[] = [
  { name: 'eventDone', label: 'analysis.done', defaultChecked: true },
  { name: 'eventFailed', label: 'analysis.failed', defaultChecked: true },
  { name: 'eventTarget', label: 'target.changed', defaultChecked: true },
];

export function CreateWebhookForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(createWebhookAction, {});
  return (
    <div className="space-y-3">
      <form action={action} className="flex flex-wrap items-end gap-3" noValidate>
        <Field label="Receiving address" name="url" placeholder="https://rig-hub.example.test/veilmeter" errors={state.fieldErrors?.url} className="min-w-80 flex-1" />
        <CheckRow legend="Events" options={EVENTS} />
        <Button type="submit" disabled={pending}>
          Add webhook
        </Button>
      </form>
      <OneTimeSecret state={state} groupError="events" testId="new-webhook-secret" />
    </div>
  );
}

export function DeleteWebhookButton({ id }: { id: string }) {
  return <RowActionButton id={id} label="Remove" tone="danger" action={deleteWebhookAction} />;
}
