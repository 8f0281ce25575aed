'use client';

import { useActionState, useEffect, useRef } from 'react';
import { createProjectAction, deleteProjectAction, renameProjectAction } from '@/app/(lab)/projects/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { FormStatus } from '@/components/ui/form-status';
import type { FormState } from '@/lib/form-state';

export function CreateProjectForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(createProjectAction, {});
  const ref = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (state.ok) ref.current?.reset();
  }, [state]);
  return (
    <form ref={ref} action={action} className="space-y-3" noValidate>
      <Field label="Name" name="name" placeholder="e.g. Visor V2 birdbath" defaultValue={state.ok ? undefined : state.values?.name} errors={state.fieldErrors?.name} maxLength={500} />
      <Field label="Description (optional)" name="description" defaultValue={state.ok ? undefined : state.values?.description} errors={state.fieldErrors?.description} />
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={pending}>
          {pending ? 'Creating…' : 'Create project'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}

export function RenameProjectForm({ id, name }: { id: string; name: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(renameProjectAction, {});
  return (
    <form action={action} className="flex flex-wrap items-end gap-3" noValidate>
      <input type="hidden" name="id" value={id} />
      <Field label="Project name" name="name" defaultValue={state.ok ? name : (state.values?.name ?? name)} errors={state.fieldErrors?.name} className="min-w-64 flex-1" />
      <Button type="submit" tone="quiet" disabled={pending}>
        {pending ? 'Saving…' : 'Rename'}
      </Button>
      <FormStatus state={state} />
    </form>
  );
}

export function DeleteProjectForm({ id, name }: { id: string; name: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(deleteProjectAction, {});
  return (
    <form
      action={action}
      onSubmit={(e) => {
        if (!window.confirm(`Delete “${name}” with all its revisions, captures and readings? This cannot be undone.`)) e.preventDefault();
      }}
      className="flex items-center gap-3"
    >
      <input type="hidden" name="id" value={id} />
      <Button type="submit" tone="danger" disabled={pending}>
        Delete project
      </Button>
      <FormStatus state={state} />
    </form>
  );
}
