'use client';

import type { Stack } from '@/lib/schemas/stack';
import { fixed } from '@/lib/format';
import { formatLuminance } from './format';
import { hasPolariser, isWhatIfActive, type WhatIf } from './planner-model';

function Slider({
  id,
  label,
  value,
  min,
  max,
  step,
  readout,
  changed,
  onChange,
}: {
  id: string;
  label: string;
  value: number;
  min: number;
  max: number;
  step: number;
  readout: string;
  changed: boolean;
  onChange: (v: number) => void;
}) {
  return (
    <div>
      <div className="mb-1 flex items-baseline justify-between gap-2 text-sm">
        <label htmlFor={id} className="text-muted">
          {label}
        </label>
        <output htmlFor={id} data-testid={`${id}-value`} className={changed ? 'font-mono text-glow' : 'font-mono text-ink'}>
          {readout}
        </output>
      </div>
      <input
        id={id}
        type="range"
        min={min}
        max={max}
        step={step}
        value={value}
        onChange={(e) => onChange(Number(e.target.value))}
        className="w-full accent-[rgb(var(--glow))]"
      />
    </div>
  );
}

/**
 * Sliders that try a change on the prediction only. The editor's values stay as they are until
 * the change is applied to the stack and saved.
 */
export function WhatIfSliders({
  stack,
  whatIf,
  onChange,
  onReset,
  onApply,
  canApply,
}: {
  stack: Stack;
  whatIf: WhatIf;
  onChange: (w: WhatIf) => void;
  onReset: () => void;
  onApply: () => void;
  canApply: boolean;
}) {
  const splitter = stack.elements.find((e) => e.kind === 'plate-beam-splitter');
  const combiner = stack.elements.find((e) => e.kind === 'combiner');
  const display = stack.elements[0];
  const luminance = whatIf.displayLuminance ?? (display?.kind === 'display' ? display.luminance : 1000);
  const polariserOn = whatIf.polariser ?? hasPolariser(stack);
  const active = isWhatIfActive(whatIf);

  return (
    <div className="space-y-4">
      {splitter?.kind === 'plate-beam-splitter' ? (
        <Slider
          id="whatif-splitter-r"
          label="What-if splitter reflectance R"
          value={whatIf.splitterR ?? splitter.R}
          min={0.02}
          max={0.95}
          step={0.01}
          readout={fixed(whatIf.splitterR ?? splitter.R, 2)}
          changed={whatIf.splitterR !== null}
          onChange={(v) => onChange({ ...whatIf, splitterR: v })}
        />
      ) : null}
      {combiner?.kind === 'combiner' ? (
        <Slider
          id="whatif-combiner-r"
          label="What-if combiner reflectance R"
          value={whatIf.combinerR ?? combiner.R}
          min={0.02}
          max={0.95}
          step={0.01}
          readout={fixed(whatIf.combinerR ?? combiner.R, 2)}
          changed={whatIf.combinerR !== null}
          onChange={(v) => onChange({ ...whatIf, combinerR: v })}
        />
      ) : null}
      <Slider
        id="whatif-display"
        label="What-if display luminance"
        // A log slider: panels range from tens to tens of thousands of cd/m².
        value={Math.log10(Math.max(luminance, 1))}
        min={1.7}
        max={4.7}
        step={0.01}
        readout={formatLuminance(luminance)}
        changed={whatIf.displayLuminance !== null}
        onChange={(v) => onChange({ ...whatIf, displayLuminance: Math.round(10 ** v) })}
      />
      <label className="flex items-center gap-2 text-sm text-ink">
        <input
          type="checkbox"
          checked={polariserOn}
          onChange={(e) => onChange({ ...whatIf, polariser: e.target.checked })}
          className="h-4 w-4 accent-[rgb(var(--glow))]"
        />
        What-if polariser {hasPolariser(stack) ? '(the stack’s own)' : '(a typical world-side film)'}
      </label>
      <p className="text-xs text-muted">
        Moving R keeps the coating’s loss (1 − R − T), so T follows. Nothing here changes the stack until you apply it and save.
      </p>
      {active ? (
        <div className="flex flex-wrap gap-2">
          <button type="button" onClick={onReset} className="rounded-md border border-line px-3 py-1 text-xs text-muted hover:text-ink">
            Reset sliders
          </button>
          {canApply ? (
            <button type="button" onClick={onApply} className="rounded-md border border-glow/60 px-3 py-1 text-xs text-glow hover:bg-glow/10">
              Apply to stack
            </button>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
