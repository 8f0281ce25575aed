'use client';

import clsx from 'clsx';
import { Field } from '@/components/ui/field';
import { FIELD_PATH, kindName, type DraftElement, type StackErrors } from './planner-model';

type FieldSpec =
  | { name: string; label: string; kind: 'number'; hint?: string; unit?: string }
  | { name: string; label: string; kind: 'select'; options: { value: string; label: string }[] }
  | { name: string; label: string; kind: 'check'; hint?: string };

const FRACTION_HINT = 'A fraction from 0 to 1';

// Which inputs each element shows, in reading order. Some appear only when another value asks for them.
function fieldsFor(d: DraftElement): FieldSpec[] {
  const v = d.values;
  switch (d.kind) {
    case 'display':
      return [
        { name: 'luminance', label: 'Luminance (cd/m²)', kind: 'number', hint: 'Full-white luminance of the panel itself' },
        {
          name: 'polKind',
          label: 'Polarisation',
          kind: 'select',
          options: [
            { value: 'none', label: 'Unpolarised (e.g. OLED without film)' },
            { value: 'linear', label: 'Linear (e.g. LCD)' },
          ],
        },
        ...(v.polKind === 'linear' ? [{ name: 'polAngle', label: 'Polarisation angle (°)', kind: 'number' as const, hint: 'In the viewer’s frame, −180 to 180' }] : []),
        { name: 'resWidth', label: 'Resolution width (px)', kind: 'number', hint: 'Optional: with the height, gives pixels per degree' },
        { name: 'resHeight', label: 'Resolution height (px)', kind: 'number', hint: 'Optional' },
        { name: 'whiteX', label: 'White point x', kind: 'number', hint: 'Optional: the display’s own white (CIE 1931), for Δu′v′' },
        { name: 'whiteY', label: 'White point y', kind: 'number', hint: 'Optional; D65 is 0.3127, 0.3290' },
      ];
    case 'plate-beam-splitter':
      return [
        { name: 'R', label: 'Reflectance R', kind: 'number', hint: FRACTION_HINT },
        { name: 'T', label: 'Transmittance T', kind: 'number', hint: 'R + T must not exceed 1' },
        { name: 'angleDeg', label: 'Angle of incidence (°)', kind: 'number', hint: '0 to 89; 45 for a fold' },
        { name: 'n', label: 'Substrate index n', kind: 'number', hint: '1.0 to 2.5; crown glass ≈ 1.52' },
        {
          name: 'backKind',
          label: 'Back face',
          kind: 'select',
          options: [
            { value: 'uncoated', label: 'Uncoated (Fresnel reflection)' },
            { value: 'ar', label: 'Anti-reflection coated' },
          ],
        },
        ...(v.backKind === 'ar' ? [{ name: 'backR', label: 'AR residual reflectance', kind: 'number' as const, hint: 'e.g. 0.005 for 0.5 %' }] : []),
      ];
    case 'combiner':
      return [
        {
          name: 'shape',
          label: 'Shape',
          kind: 'select',
          options: [
            { value: 'curved', label: 'Curved (forms the image)' },
            { value: 'flat', label: 'Flat' },
          ],
        },
        { name: 'R', label: 'Reflectance R', kind: 'number', hint: FRACTION_HINT },
        { name: 'T', label: 'Transmittance T', kind: 'number', hint: 'R + T must not exceed 1' },
      ];
    case 'linear-polariser':
      return [
        { name: 'T1', label: 'Transmittance along axis T1', kind: 'number', hint: FRACTION_HINT },
        { name: 'T2', label: 'Transmittance across axis T2', kind: 'number', hint: 'Leakage; at most T1' },
        { name: 'axisDeg', label: 'Axis angle (°)', kind: 'number', hint: 'In the viewer’s frame' },
        { name: 'worldOnly', label: 'World side only (outside the combiner)', kind: 'check' },
      ];
    case 'neutral-filter':
      return [
        { name: 'T', label: 'Transmittance T', kind: 'number', hint: FRACTION_HINT },
        { name: 'worldOnly', label: 'World side only (e.g. a tinted visor)', kind: 'check' },
      ];
    case 'magnifier':
      return [{ name: 'T', label: 'Transmittance T', kind: 'number', hint: FRACTION_HINT }];
  }
}

export function ElementCard({
  draft,
  index,
  count,
  errors,
  readOnly,
  onChange,
  onMove,
  onRemove,
}: {
  draft: DraftElement;
  index: number;
  count: number;
  errors: StackErrors;
  readOnly: boolean;
  onChange: (name: string, value: string) => void;
  onMove: (delta: -1 | 1) => void;
  onRemove: () => void;
}) {
  const own = errors[String(index)];
  const errorsOf = (name: string) => errors[`${index}.${FIELD_PATH[name] ?? name}`];
  const id = (name: string) => `${draft.key}-${name}`;
  const n = index + 1;

  return (
    <li
      data-testid={`element-${n}`}
      data-kind={draft.kind}
      className={clsx('rounded-lg border bg-canvas/60', own?.length ? 'border-fail/60' : 'border-line')}
    >
      <div className="flex flex-wrap items-center gap-2 border-b border-line px-3 py-2">
        <span className="flex h-6 w-6 items-center justify-center rounded-full bg-raised font-mono text-xs text-muted">{n}</span>
        <span className="text-sm font-semibold text-ink">{kindName(draft.kind)}</span>
        <input
          aria-label={`Label of element ${n}`}
          value={draft.values.label ?? ''}
          onChange={(e) => onChange('label', e.target.value)}
          readOnly={readOnly}
          placeholder="label"
          maxLength={80}
          className="min-w-0 flex-1 rounded border border-transparent bg-transparent px-2 py-0.5 text-sm text-muted hover:border-line focus:border-beam focus:text-ink"
        />
        {!readOnly ? (
          <div className="flex gap-1">
            <IconButton label={`Move element ${n} up`} disabled={index === 0} onClick={() => onMove(-1)}>
              ↑
            </IconButton>
            <IconButton label={`Move element ${n} down`} disabled={index === count - 1} onClick={() => onMove(1)}>
              ↓
            </IconButton>
            <IconButton label={`Remove element ${n}`} onClick={onRemove} danger>
              ✕
            </IconButton>
          </div>
        ) : null}
      </div>
      {errors[`${index}.label`]?.length ? <p className="px-3 pt-2 text-xs text-fail">{errors[`${index}.label`]?.join(' ')}</p> : null}
      {own?.length ? (
        <p role="alert" className="px-3 pt-2 text-xs text-fail">
          {own.join(' ')}
        </p>
      ) : null}
      <div className="grid gap-3 p-3 sm:grid-cols-2">
        {fieldsFor(draft).map((f) => {
          const value = draft.values[f.name] ?? '';
          if (f.kind === 'number') {
            return (
              <Field
                key={f.name}
                name={id(f.name)}
                label={f.label}
                hint={f.hint}
                errors={errorsOf(f.name)}
                inputMode="decimal"
                autoComplete="off"
                value={value}
                readOnly={readOnly}
                onChange={(e) => onChange(f.name, e.target.value)}
                className="[&_input]:font-mono [&_input]:tabular-nums"
              />
            );
          }
          if (f.kind === 'select') {
            return (
              <label key={f.name} className="block text-sm">
                <span className="mb-1 block text-muted">{f.label}</span>
                <select
                  value={value}
                  disabled={readOnly}
                  onChange={(e) => onChange(f.name, e.target.value)}
                  className="w-full rounded-md border border-line bg-canvas px-3 py-2 text-ink focus:border-beam disabled:opacity-80"
                >
                  {f.options.map((o) => (
                    <option key={o.value} value={o.value}>
                      {o.label}
                    </option>
                  ))}
                </select>
              </label>
            );
          }
          return (
            <label key={f.name} className="flex items-center gap-2 self-end pb-2 text-sm text-ink sm:col-span-2">
              <input
                type="checkbox"
                checked={value === 'true'}
                disabled={readOnly}
                onChange={(e) => onChange(f.name, e.target.checked ? 'true' : 'false')}
                className="h-4 w-4 accent-[rgb(var(--beam))]"
              />
              {f.label}
            </label>
          );
        })}
      </div>
    </li>
  );
}

function IconButton({ label, onClick, disabled, danger, children }: { label: string; onClick: () => void; disabled?: boolean; danger?: boolean; children: React.ReactNode }) {
  return (
    <button
      type="button"
      aria-label={label}
      title={label}
      disabled={disabled}
      onClick={onClick}
      className={clsx(
        'h-7 w-7 rounded-md border border-line text-sm disabled:opacity-30',
        danger ? 'text-muted hover:border-fail/60 hover:text-fail' : 'text-muted hover:border-beam/60 hover:text-ink',
      )}
    >
      {children}
    </button>
  );
}
