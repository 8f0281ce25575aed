'use client';

import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import type { StackElementKind } from '@/lib/schemas/stack';
import { formatLuminance, formatPercent } from '@/lib/format';
import { predictedMeasuredCells } from './comparison';
import { ElementCard } from './element-card';
import { ELEMENT_KINDS, kindName, newElement, type DraftElement } from './planner-model';
import type { PredictedMeasured, VariantDraft } from './workbench-model';

/**
 * Each variant of the revision as a change to the base stack: tick the base parts it leaves out,
 * add the parts only it has. Saved with the stack.
 */
export function VariantStacksEditor({
  names,
  base,
  drafts,
  errors,
  readOnly,
  onChange,
}: {
  names: string[];
  base: DraftElement[];
  drafts: Record<string, VariantDraft>;
  errors: Record<string, string>;
  readOnly: boolean;
  onChange: (next: Record<string, VariantDraft>) => void;
}) {
  if (names.length === 0) {
    return <p className="text-sm text-muted">No variants yet: give capture sets of this revision a variant label (say, with and without polarizer) to model each one’s stack here.</p>;
  }
  const set = (name: string, d: VariantDraft) => onChange({ ...drafts, [name]: d });
  return (
    <div className="space-y-4" data-testid="variant-stacks">
      {names.map((name, vi) => {
        const d = drafts[name] ?? { without: [], add: [] };
        return (
          <fieldset key={name} className="rounded-md border border-line p-3" data-variant={name}>
            <legend className="px-1 text-sm font-medium text-ink">{name}</legend>
            <p className="mb-2 text-xs text-muted">{d.without.length || d.add.length ? 'The base stack, changed as below.' : 'Same as the base stack.'}</p>
            {base.length ? (
              <div className="mb-2 flex flex-wrap gap-x-4 gap-y-1 text-sm">
                <span className="text-muted">Leaves out:</span>
                {base.map((b, i) =>
                  b.kind === 'display' ? null : (
                    <label key={b.key} className="inline-flex items-center gap-1.5">
                      <input
                        type="checkbox"
                        disabled={readOnly}
                        checked={d.without.includes(i)}
                        onChange={(e) => set(name, { ...d, without: e.target.checked ? [...d.without, i] : d.without.filter((x) => x !== i) })}
                        aria-label={`${name}: leave out ${b.values.label || kindName(b.kind)}`}
                      />
                      {b.values.label || kindName(b.kind)}
                    </label>
                  ),
                )}
              </div>
            ) : null}
            {d.add.length ? (
              <ol className="space-y-2" aria-label={`Parts only ${name} has`}>
                {d.add.map((el, i) => (
                  <ElementCard
                    key={el.key}
                    draft={el}
                    index={i}
                    count={d.add.length}
                    errors={{}}
                    readOnly={readOnly}
                    onChange={(field, value) => set(name, { ...d, add: d.add.map((x, j) => (j === i ? { ...x, values: { ...x.values, [field]: value } } : x)) })}
                    onMove={() => {}}
                    onRemove={() => set(name, { ...d, add: d.add.filter((_, j) => j !== i) })}
                  />
                ))}
              </ol>
            ) : null}
            {!readOnly ? (
              <div className="mt-2 flex flex-wrap items-end gap-2">
                <label className="text-sm">
                  <span className="mb-1 block text-muted">Adds a part</span>
                  <select id={`variant-add-${vi}`} defaultValue="linear-polariser" className="rounded-md border border-line bg-canvas px-3 py-1.5 text-ink">
                    {ELEMENT_KINDS.filter((k) => k.kind !== 'display').map((k) => (
                      <option key={k.kind} value={k.kind}>
                        {k.name}
                      </option>
                    ))}
                  </select>
                </label>
                <Button
                  type="button"
                  tone="quiet"
                  onClick={() => {
                    const sel = document.getElementById(`variant-add-${vi}`) as HTMLSelectElement | null;
                    set(name, { ...d, add: [...d.add, newElement((sel?.value ?? 'linear-polariser') as StackElementKind)] });
                  }}
                >
                  Add to {name}
                </Button>
              </div>
            ) : null}
            {errors[name] ? (
              <p role="alert" className="mt-2 text-sm text-fail">
                {errors[name]}
              </p>
            ) : null}
          </fieldset>
        );
      })}
    </div>
  );
}

const COLUMNS = [
  { key: 'variant', label: 'Variant' },
  { key: 'readings', label: 'Readings', numeric: true },
  { key: 'background', label: 'Median background', numeric: true },
  { key: 'acrPredicted', label: 'Contrast predicted', numeric: true },
  { key: 'acrMeasured', label: 'Contrast measured', numeric: true },
  { key: 'tauPredicted', label: 'Transmission predicted', numeric: true },
  { key: 'tauMeasured', label: 'Transmission measured', numeric: true },
  { key: 'ghostPredicted', label: 'Ghost predicted', numeric: true },
  { key: 'ghostMeasured', label: 'Ghost measured', numeric: true },
  { key: 'etaPredicted', label: 'η entered stack', numeric: true },
  { key: 'etaFitted', label: 'η the readings show', numeric: true },
  { key: 'atEye', label: 'Display at the eye, fitted', numeric: true },
];

/** Each variant's own stack against its own readings. */
export function VariantPredictedMeasured({ rows, csvName }: { rows: PredictedMeasured[]; csvName: string }) {
  return (
    <div data-testid="variant-predicted-measured">
      <DataTable
        csvName={csvName}
        columns={COLUMNS}
        rows={rows.map((p) => ({
          id: p.variant || '-',
          cells: {
            ...predictedMeasuredCells(p),
            variant: { text: p.stackError ? `${p.variant || '—'} (${p.stackError})` : p.variant || 'no variant label', sort: p.variant },
            etaPredicted: { text: formatPercent(p.etaPredicted), sort: p.etaPredicted },
            etaFitted: { text: p.fit.eta ? `${formatPercent(p.fit.eta.mean, { uncertainty: p.fit.eta.halfWidth })}${p.fit.eta.halfWidth !== null ? ` ± ${formatPercent(p.fit.eta.halfWidth, { uncertainty: p.fit.eta.halfWidth })}` : ''}${p.fit.estimated ? ' (estimated backgrounds)' : ''}` : '—', sort: p.fit.eta?.mean ?? null },
            atEye: { text: p.fit.atEye ? formatLuminance(p.fit.atEye.mean, { uncertainty: p.fit.atEye.halfWidth, estimate: p.fit.estimated && p.fit.atEye.halfWidth === null }) : '—', sort: p.fit.atEye?.mean ?? null },
          },
        }))}
      />
    </div>
  );
}
