'use client';

import { useActionState, useId } from 'react';
import { deleteCaptureSetAction, updateCaptureSetAction } from '@/app/(lab)/captures/[captureId]/actions';
import { createCaptureSetAction } from '@/app/(lab)/projects/[projectId]/revisions/actions';
import { FormStatus, keepValues, SelectField, TextArea } from '@/components/revisions/revision-forms';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import type { FormState } from '@/lib/form-state';
import { CAPTURE_PATTERNS, PATTERN_NAMES } from '@/lib/schemas/capture-set';

type Values = { label?: string; variant?: string; pattern?: string; tiffEncoding?: string; ambientLux?: number; backgroundCdm2?: number; displayLevel?: string; notes?: string };

/** The fields of a capture set, shared by the new and the edit form. */
function CaptureSetFields({ errors: e, values: v, variants = [] }: { errors: Record<string, string[]>; values: Values; variants?: string[] }) {
  // the revision's existing variants are offered, so a typo does not split a group in two
  const listId = useId();
  return (
    <div className="grid gap-3 sm:grid-cols-3">
      <Field label="Label" name="label" placeholder="e.g. Window light, 0°" defaultValue={v.label} errors={e.label} maxLength={120} />
      <Field label="Variant (for A/B)" name="variant" placeholder="e.g. with polarizer" defaultValue={v.variant} errors={e.variant} maxLength={80} list={listId} autoComplete="off" hint={variants.length ? `In this revision: ${variants.join(', ')}` : undefined} />
      <datalist id={listId} data-testid="variant-options">
        {variants.map((x) => (
          <option key={x} value={x} />
        ))}
      </datalist>
      <SelectField
        label="Pattern on the display"
        name="pattern"
        defaultValue={v.pattern}
        options={CAPTURE_PATTERNS.map((p) => ({ value: p, label: PATTERN_NAMES[p].choice }))}
        errors={e.pattern}
      />
      <Field label="Ambient illuminance (lx)" name="ambientLux" inputMode="decimal" placeholder="if measured" defaultValue={v.ambientLux} errors={e.ambientLux} />
      <Field label="Background luminance (cd/m²)" name="backgroundCdm2" inputMode="decimal" placeholder="if measured" defaultValue={v.backgroundCdm2} errors={e.backgroundCdm2} />
      <Field label="Display level" name="displayLevel" placeholder="e.g. 80 % brightness" defaultValue={v.displayLevel} errors={e.displayLevel} maxLength={80} />
      <div className="sm:col-span-3">
        <TiffEncodingField value={v.tiffEncoding} errors={e.tiffEncoding} />
      </div>
      <div className="sm:col-span-3">
        <TextArea label="Notes" name="notes" defaultValue={v.notes} errors={e.notes} />
      </div>
    </div>
  );
}

/** The set's 16-bit TIFF encoding, with when to choose which and the rule "as each file says" follows. */
function TiffEncodingField({ value, errors }: { value?: string; errors?: string[] }) {
  return (
    <div className="grid gap-3 sm:grid-cols-3">
      <SelectField
        label="16-bit TIFF encoding"
        name="tiffEncoding"
        defaultValue={value ?? 'auto'}
        options={[
          { value: 'auto', label: 'As each file says' },
          { value: 'linear', label: 'Linear 16-bit (raw conversion without gamma)' },
          { value: 'srgb', label: 'Gamma-encoded (sRGB)' },
        ]}
        errors={errors}
      />
      <div className="text-xs text-muted sm:col-span-2" data-testid="tiff-encoding-help">
        <p>
          Choose <strong className="text-ink">linear 16-bit</strong> when the photos are 16-bit TIFFs converted from camera raw with no gamma curve (a raw converter’s “linear” output): their values are then proportional to light. Camera raw
          files are better still: upload them as they are (no conversion), and they are always read as linear. JPEG, PNG, WebP and 8-bit files are always read as sRGB-encoded; declaring them linear is refused.
        </p>
        <p className="mt-1">
          <strong className="text-ink">As each file says</strong> reads a 16-bit TIFF as linear when it carries a colour profile with straight (gamma 1.0) tone curves, or no colour profile at all; a TIFF with an sRGB, Adobe RGB or other gamma
          profile (or a gamma transfer function) is read as gamma-encoded. Each photo shows what its file said, and can be set on its own.
        </p>
      </div>
    </div>
  );
}

export function CreateCaptureSetForm({ revisionId, variants }: { revisionId: string; variants?: string[] }) {
  const [state, action, pending] = useActionState<FormState, FormData>(createCaptureSetAction, {});
  return (
    <form onSubmit={keepValues(action)} className="space-y-3" noValidate aria-label="New capture set">
      <input type="hidden" name="revisionId" value={revisionId} />
      <CaptureSetFields errors={state.fieldErrors ?? {}} values={{}} variants={variants} />
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={pending}>
          {pending ? 'Creating…' : 'Create capture set'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}

export function EditCaptureSetForm({ id, values, variants }: { id: string; values: Values; variants?: string[] }) {
  const [state, action, pending] = useActionState<FormState, FormData>(updateCaptureSetAction, {});
  return (
    <form onSubmit={keepValues(action)} className="space-y-3" noValidate aria-label="Edit capture set">
      <input type="hidden" name="id" value={id} />
      <CaptureSetFields errors={state.fieldErrors ?? {}} values={values} variants={variants} />
      <p className="text-xs text-muted">A changed pattern or region applies from the next analysis; earlier readings keep what they were measured with.</p>
      <div className="flex items-center gap-3">
        <Button type="submit" tone="quiet" disabled={pending}>
          {pending ? 'Saving…' : 'Save capture set'}
        </Button>
        <FormStatus state={state} />
      </div>
    </form>
  );
}

export function DeleteCaptureSetForm({ id, label }: { id: string; label: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(deleteCaptureSetAction, {});
  return (
    <form
      action={action}
      onSubmit={(e) => {
        if (!window.confirm(`Delete “${label}” with its photos, analyses and readings? This cannot be undone.`)) e.preventDefault();
      }}
      className="flex items-center gap-3"
    >
      <input type="hidden" name="id" value={id} />
      <Button type="submit" tone="danger" disabled={pending}>
        {pending ? 'Deleting…' : 'Delete capture set'}
      </Button>
      <FormStatus state={state} />
    </form>
  );
}
