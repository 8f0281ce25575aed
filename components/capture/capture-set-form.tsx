'use client';

import { useActionState } from 'react';
import { createCaptureSetAction } from '@/app/(lab)/projects/[projectId]/revisions/actions';
import { FormStatus, keepValues, SelectField, TextArea } from '@/components/revisions/revision-forms';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/auth/action';

export function CreateCaptureSetForm({ revisionId }: { revisionId: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(createCaptureSetAction, {});
  const e = state.fieldErrors ?? {};
  return (
    <form onSubmit={keepValues(action)} className="space-y-3" noValidate aria-label="New capture set">
      <input type="hidden" name="revisionId" value={revisionId} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Label" name="label" placeholder="e.g. Window light, 0°" errors={e.label} maxLength={120} />
        <Field label="Variant (for A/B)" name="variant" placeholder="e.g. with polarizer" errors={e.variant} maxLength={80} />
        <SelectField
          label="Pattern on the display"
          name="pattern"
          options={[
            { value: 'full', label: 'Full-field white' },
            { value: 'checkerboard', label: '4 × 4 checkerboard' },
          ]}
          errors={e.pattern}
        />
        <Field label="Ambient illuminance (lx)" name="ambientLux" inputMode="decimal" placeholder="if measured" errors={e.ambientLux} />
        <Field label="Background luminance (cd/m²)" name="backgroundCdm2" inputMode="decimal" placeholder="if measured" errors={e.backgroundCdm2} />
        <Field label="Display level" name="displayLevel" placeholder="e.g. 80 % brightness" errors={e.displayLevel} maxLength={80} />
        <div className="sm:col-span-3">
          <TextArea label="Notes" name="notes" errors={e.notes} />
        </div>
      </div>
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={pending}>
          {pending ? 'Creating…' : 'Create capture set'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}
