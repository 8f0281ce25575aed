'use client';

import { startTransition, useActionState, useEffect, useRef, type FormEvent } from 'react';
import { createRevisionAction, updateRevisionAction } from '@/app/(lab)/projects/[projectId]/revisions/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/form-state';
import { REVISION_STATUSES } from '@/lib/schemas/revision';

/**
 * Submits through the action without React's automatic form reset, so a refused form keeps what
 * the person typed next to the messages.
 */
export function keepValues(action: (fd: FormData) => void) {
  return (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    startTransition(() => action(fd));
  };
}

export function FormStatus({ state }: { state: FormState }) {
  if (!state.message) return null;
  return (
    <p role={state.ok ? 'status' : 'alert'} className={state.ok ? 'text-sm text-pass' : 'text-sm text-fail'}>
      {state.message}
    </p>
  );
}

export function SelectField({ label, name, options, defaultValue, errors }: { label: string; name: string; options: readonly { value: string; label: string }[]; defaultValue?: string; errors?: string[] }) {
  return (
    <label className="block text-sm">
      <span className="mb-1 block text-muted">{label}</span>
      <select name={name} defaultValue={defaultValue} aria-invalid={errors?.length ? true : undefined} className="w-full rounded-md border border-line bg-canvas px-3 py-2 text-ink focus:border-beam">
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {errors?.length ? (
        <span role="alert" className="mt-1 block text-xs text-fail">
          {errors.join(' ')}
        </span>
      ) : null}
    </label>
  );
}

export function TextArea({ label, name, defaultValue, errors }: { label: string; name: string; defaultValue?: string; errors?: string[] }) {
  return (
    <label className="block text-sm">
      <span className="mb-1 block text-muted">{label}</span>
      <textarea name={name} defaultValue={defaultValue} rows={2} className="w-full rounded-md border border-line bg-canvas px-3 py-2 text-ink focus:border-beam" />
      {errors?.length ? (
        <span role="alert" className="mt-1 block text-xs text-fail">
          {errors.join(' ')}
        </span>
      ) : null}
    </label>
  );
}

const STATUS_OPTIONS = REVISION_STATUSES.map((s) => ({ value: s, label: s[0]?.toUpperCase() + s.slice(1) }));

type RevisionValues = { id?: string; label?: string; builtOn?: string | null; position?: number; notes?: string; status?: string };

function RevisionFields({ state, values }: { state: FormState; values: RevisionValues }) {
  const e = state.fieldErrors ?? {};
  return (
    <div className="grid gap-3 sm:grid-cols-4">
      <Field label="Label" name="label" defaultValue={values.label} placeholder="e.g. VX-D" errors={e.label} maxLength={80} />
      <Field label="Built on" name="builtOn" type="date" defaultValue={values.builtOn ?? ''} errors={e.builtOn} />
      <Field label="Order" name="position" type="number" min={1} defaultValue={values.position ?? ''} hint={values.id ? undefined : 'Blank: after the last'} errors={e.position} />
      <SelectField label="Status" name="status" options={STATUS_OPTIONS} defaultValue={values.status ?? 'planned'} errors={e.status} />
      <div className="sm:col-span-4">
        <TextArea label="Notes" name="notes" defaultValue={values.notes} errors={e.notes} />
      </div>
    </div>
  );
}

export function CreateRevisionForm({ projectId }: { projectId: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(createRevisionAction, {});
  const ref = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (state.ok) ref.current?.reset();
  }, [state]);
  return (
    <form ref={ref} onSubmit={keepValues(action)} className="space-y-3" noValidate aria-label="New revision">
      <input type="hidden" name="projectId" value={projectId} />
      <RevisionFields state={state} values={{}} />
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={pending}>
          {pending ? 'Adding…' : 'Add revision'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}

export function EditRevisionForm({ revision }: { revision: Required<Omit<RevisionValues, 'builtOn'>> & { builtOn: string | null } }) {
  const [state, action, pending] = useActionState<FormState, FormData>(updateRevisionAction, {});
  return (
    <form onSubmit={keepValues(action)} className="space-y-3" noValidate aria-label="Edit revision">
      <input type="hidden" name="id" value={revision.id} />
      <RevisionFields state={state} values={revision} />
      <div className="flex items-center gap-3">
        <Button type="submit" tone="quiet" disabled={pending}>
          {pending ? 'Saving…' : 'Save revision'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}
