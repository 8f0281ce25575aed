'use client';

import { useActionState } from 'react';
import { adoptDefaultTargetAction, createTargetAction, deleteTargetAction, updateTargetAction } from '@/app/(lab)/projects/[projectId]/targets/actions';
import { FormStatus, keepValues, SelectField } from '@/components/revisions/revision-forms';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/auth/action';
import type { Target } from '@/lib/targets/evaluate';
import { metricLabelWithUnit, METRIC_LIST } from '@/lib/targets/metrics';

const METRIC_OPTIONS = METRIC_LIST.map((m) => ({ value: m.key, label: metricLabelWithUnit(m) }));
const COMPARATOR_OPTIONS = [
  { value: '>=', label: 'at least (≥)' },
  { value: '<=', label: 'at most (≤)' },
];

function TargetFields({ state, initial, idPrefix }: { state: FormState; initial?: Partial<Target>; idPrefix: string }) {
  const v = state.ok ? undefined : state.values;
  return (
    <div className="grid gap-3 sm:grid-cols-[1.4fr_1fr_0.8fr_2fr]">
      <SelectField label="Metric" name="metric" options={METRIC_OPTIONS} defaultValue={v?.metric ?? initial?.metric ?? 'ambientContrastRatio'} errors={state.fieldErrors?.metric} />
      <SelectField label="Must be" name="comparator" options={COMPARATOR_OPTIONS} defaultValue={v?.comparator ?? initial?.comparator ?? '>='} errors={state.fieldErrors?.comparator} />
      <Field label="Value" name="value" id={`${idPrefix}-value`} inputMode="decimal" defaultValue={v?.value ?? (initial?.value !== undefined ? String(initial.value) : '')} errors={state.fieldErrors?.value} />
      <Field label="Condition (e.g. ambient level)" name="conditionNote" id={`${idPrefix}-cond`} defaultValue={v?.conditionNote ?? initial?.conditionNote ?? ''} errors={state.fieldErrors?.conditionNote} maxLength={400} />
    </div>
  );
}

export function CreateTargetForm({ projectId }: { projectId: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(createTargetAction, {});
  return (
    <form onSubmit={keepValues(action)} className="space-y-3" noValidate aria-label="New target" key={state.ok ? state.message : 'form'}>
      <input type="hidden" name="projectId" value={projectId} />
      <TargetFields state={state} idPrefix="new-target" />
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={pending}>
          {pending ? 'Adding…' : 'Add target'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}

export function EditTargetForm({ projectId, target }: { projectId: string; target: Target }) {
  const [state, action, pending] = useActionState<FormState, FormData>(updateTargetAction, {});
  const [delState, del, deleting] = useActionState<FormState, FormData>(deleteTargetAction, {});
  return (
    <div className="space-y-2">
      <form onSubmit={keepValues(action)} className="space-y-2" noValidate aria-label="Edit target">
        <input type="hidden" name="projectId" value={projectId} />
        <input type="hidden" name="id" value={target.id} />
        {target.isDefault ? <input type="hidden" name="isDefault" value="true" /> : null}
        <TargetFields state={state} initial={target} idPrefix={`t-${target.id}`} />
        <div className="flex items-center gap-3">
          <Button type="submit" tone="quiet" disabled={pending}>
            {pending ? 'Saving…' : 'Save'}
          </Button>
          <FormStatus state={state} />
        </div>
      </form>
      <form
        action={del}
        onSubmit={(e) => {
          if (!window.confirm('Remove this target?')) e.preventDefault();
        }}
        className="flex items-center gap-3"
      >
        <input type="hidden" name="projectId" value={projectId} />
        <input type="hidden" name="id" value={target.id} />
        <Button type="submit" tone="danger" disabled={deleting}>
          Remove
        </Button>
        <FormStatus state={delState} />
      </form>
    </div>
  );
}

export function AdoptDefaultButton({ projectId, defaultId, label }: { projectId: string; defaultId: string; label: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(adoptDefaultTargetAction, {});
  return (
    <form action={action} className="flex items-center gap-3">
      <input type="hidden" name="projectId" value={projectId} />
      <input type="hidden" name="defaultId" value={defaultId} />
      <Button type="submit" tone="quiet" disabled={pending} aria-label={`Use default: ${label}`}>
        {pending ? 'Adding…' : 'Use this default'}
      </Button>
      <FormStatus state={state} />
    </form>
  );
}
