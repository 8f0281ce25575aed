'use client';

import { useActionState, useState } from 'react';
import { adoptDefaultTargetAction, createTargetAction, deleteTargetAction, updateTargetAction } from '@/app/(lab)/projects/[projectId]/targets/actions';
import { FormStatus, keepValues, SelectField } from '@/components/revisions/revision-forms';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/form-state';
import { exact, inputUnit, metricHeading, toShown } from '@/lib/format';
import type { Target } from '@/lib/targets/evaluate';
import { isMetricKey, METRIC_LIST, type MetricKey } from '@/lib/targets/metrics';

const METRIC_OPTIONS = METRIC_LIST.map((m) => ({ value: m.key, label: metricHeading(m.key) }));
const COMPARATOR_OPTIONS = [
  { value: '>=', label: 'at least (≥)' },
  { value: '<=', label: 'at most (≤)' },
];
const PATTERN_OPTIONS = [
  { value: '', label: 'any pattern' },
  { value: 'full', label: 'full white' },
  { value: 'checkerboard', label: 'checkerboard' },
  { value: 'slanted-edge', label: 'slanted edge' },
];

const num = (v: number | undefined) => (v === undefined ? '' : String(v));

/** The variants a target is judged on: none ticked means every variant, each on its own. */
function VariantPicker({ known, initial, idPrefix }: { known: string[]; initial: string[]; idPrefix: string }) {
  const [chosen, setChosen] = useState<string[]>(initial);
  const all = [...new Set([...known, ...initial])].sort((a, b) => a.localeCompare(b));
  return (
    <fieldset className="text-sm">
      <legend className="mb-1 text-muted">Judged on variants</legend>
      <input type="hidden" name="variants" value={chosen.join('\n')} />
      {all.length === 0 ? (
        <p className="text-xs text-muted">Every variant, each on its own (this project has no variant labels yet).</p>
      ) : (
        <div className="flex flex-wrap gap-x-4 gap-y-1">
          {all.map((v, i) => (
            <label key={v} className="inline-flex items-center gap-1.5" htmlFor={`${idPrefix}-v${i}`}>
              <input
                id={`${idPrefix}-v${i}`}
                type="checkbox"
                checked={chosen.includes(v)}
                onChange={(e) => setChosen(e.target.checked ? [...chosen, v] : chosen.filter((x) => x !== v))}
              />
              {v}
            </label>
          ))}
          <span className="basis-full text-xs text-muted">{chosen.length ? 'A revision passes this target only as the ticked variants.' : 'None ticked: every variant, each judged on its own.'}</span>
        </div>
      )}
    </fieldset>
  );
}

function TargetFields({ state, initial, idPrefix, variants }: { state: FormState; initial?: Partial<Target>; idPrefix: string; variants: string[] }) {
  const v = state.ok ? undefined : state.values;
  const startMetric = v?.metric ?? initial?.metric ?? 'ambientContrastRatio';
  const [metric, setMetric] = useState<MetricKey>(isMetricKey(startMetric) ? startMetric : 'ambientContrastRatio');
  const unit = inputUnit(metric);
  const c = initial?.condition ?? {};
  const shownValue = initial?.value !== undefined && initial.metric ? exact(toShown(initial.metric, initial.value)).replace(/,/g, '').replace('−', '-') : '';
  return (
    <div className="space-y-3">
      <input type="hidden" name="valueIn" value="shown" />
      <div className="grid gap-3 sm:grid-cols-[1.4fr_1fr_0.8fr]">
        <label className="block text-sm">
          <span className="mb-1 block text-muted">Metric</span>
          <select
            name="metric"
            value={metric}
            onChange={(e) => setMetric(e.target.value as MetricKey)}
            className="w-full rounded-md border border-line bg-canvas px-3 py-2 text-ink focus:border-beam"
          >
            {METRIC_OPTIONS.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </label>
        <SelectField label="Must be" name="comparator" options={COMPARATOR_OPTIONS} defaultValue={v?.comparator ?? initial?.comparator ?? '>='} errors={state.fieldErrors?.comparator} />
        <Field label={unit ? `Value (${unit.trim()})` : 'Value'} name="value" id={`${idPrefix}-value`} inputMode="decimal" defaultValue={v?.value ?? shownValue} errors={state.fieldErrors?.value} />
      </div>
      <fieldset className="rounded-md border border-line px-3 pb-3 pt-1">
        <legend className="px-1 text-xs uppercase tracking-wider text-muted">Condition: only capture sets that state these are judged</legend>
        <div className="grid gap-3 sm:grid-cols-5">
          <Field label="Ambient from (lx)" name="ambientLuxMin" id={`${idPrefix}-lux-min`} inputMode="decimal" defaultValue={v?.ambientLuxMin ?? num(c.ambientLuxMin)} errors={state.fieldErrors?.ambientLuxMin} />
          <Field label="Ambient to (lx)" name="ambientLuxMax" id={`${idPrefix}-lux-max`} inputMode="decimal" defaultValue={v?.ambientLuxMax ?? num(c.ambientLuxMax)} errors={state.fieldErrors?.ambientLuxMax} />
          <Field label="Background from (cd/m²)" name="backgroundCdm2Min" id={`${idPrefix}-bg-min`} inputMode="decimal" defaultValue={v?.backgroundCdm2Min ?? num(c.backgroundCdm2Min)} errors={state.fieldErrors?.backgroundCdm2Min} />
          <Field label="Background to (cd/m²)" name="backgroundCdm2Max" id={`${idPrefix}-bg-max`} inputMode="decimal" defaultValue={v?.backgroundCdm2Max ?? num(c.backgroundCdm2Max)} errors={state.fieldErrors?.backgroundCdm2Max} />
          <SelectField label="Pattern" name="pattern" options={PATTERN_OPTIONS} defaultValue={v?.pattern ?? c.pattern ?? ''} errors={state.fieldErrors?.pattern} />
        </div>
        <div className="mt-3 grid gap-3 sm:grid-cols-2">
          <Field label="Note" name="conditionNote" id={`${idPrefix}-cond`} defaultValue={v?.conditionNote ?? initial?.conditionNote ?? ''} errors={state.fieldErrors?.conditionNote} maxLength={300} hint="Free text kept beside the condition (e.g. office desk)" />
          <VariantPicker known={variants} initial={v?.variants !== undefined ? v.variants.split('\n').filter(Boolean) : (initial?.variants ?? [])} idPrefix={idPrefix} />
        </div>
      </fieldset>
    </div>
  );
}

export function CreateTargetForm({ projectId, variants = [] }: { projectId: string; variants?: string[] }) {
  const [state, action, pending] = useActionState<FormState, FormData>(createTargetAction, {});
  return (
    <form onSubmit={keepValues(action)} className="space-y-3" noValidate aria-label="New target" key={state.ok ? state.message : 'form'}>
      <input type="hidden" name="projectId" value={projectId} />
      <TargetFields state={state} idPrefix="new-target" variants={variants} />
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={pending}>
          {pending ? 'Adding…' : 'Add target'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}

export function EditTargetForm({ projectId, target, variants = [] }: { projectId: string; target: Target; variants?: string[] }) {
  const [state, action, pending] = useActionState<FormState, FormData>(updateTargetAction, {});
  const [delState, del, deleting] = useActionState<FormState, FormData>(deleteTargetAction, {});
  return (
    <div className="space-y-2">
      <form onSubmit={keepValues(action)} className="space-y-2" noValidate aria-label="Edit target">
        <input type="hidden" name="projectId" value={projectId} />
        <input type="hidden" name="id" value={target.id} />
        {target.isDefault ? <input type="hidden" name="isDefault" value="true" /> : null}
        <TargetFields state={state} initial={target} idPrefix={`t-${target.id}`} variants={variants} />
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
