'use client';

import { Button } from '@/components/ui/button';
import { FormStatus } from '@/components/ui/form-status';
import type { FormState } from '@/lib/form-state';
import { useActionState } from 'react';

export type CheckOption = { name: string; label: string; title?: string; defaultChecked?: boolean };

/** A row of labelled checkboxes (token scopes, webhook events) with a legend for screen readers. */
export function CheckRow({ legend, options }: { legend: string; options: readonly CheckOption[] }) {
  return (
    <fieldset className="flex flex-wrap items-center gap-3 text-sm">
      <legend className="sr-only">{legend}</legend>
      {options.map((o) => (
        <label key={o.name} className="flex items-center gap-1" title={o.title}>
          <input type="checkbox" name={o.name} defaultChecked={o.defaultChecked} /> {o.label}
        </label>
      ))}
    </fieldset>
  );
}

/**
 * Under a create form: the errors of a group of checkboxes, then the secret the action made, shown
 * this once with the action's message, or the form's status when there is none.
 */
export function OneTimeSecret({ state, groupError, testId }: { state: FormState; groupError: string; testId: string }) {
  const errors = state.fieldErrors?.[groupError];
  return (
    <>
      {errors ? <p className="text-xs text-fail">{errors.join(' ')}</p> : null}
      {state.secret ? (
        <div className="rounded-md border border-glow/50 bg-glow/10 p-3 text-sm">
          <p className="mb-2 text-ink">{state.message}</p>
          <code data-testid={testId} className="block break-all rounded bg-canvas px-2 py-1 font-mono text-xs text-glow">
            {state.secret}
          </code>
        </div>
      ) : (
        <FormStatus small state={state} />
      )}
    </>
  );
}

/** A one-button form that sends a row's id to an action (revoke, remove, withdraw) and shows its answer. */
export function RowActionButton({ id, label, tone, action: serverAction }: { id: string; label: string; tone: 'quiet' | 'danger'; action: (state: FormState, form: FormData) => Promise<FormState> }) {
  const [state, action, pending] = useActionState<FormState, FormData>(serverAction, {});
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="id" value={id} />
      <Button type="submit" tone={tone} disabled={pending}>
        {label}
      </Button>
      <FormStatus small state={state} />
    </form>
  );
}
