import type { Stack } from '../schemas/stack';
import { stackBudget, type StackBudget } from './budget';
import { contrastCurve, type ContrastCurveOptions, type ContrastPoint } from './contrast';
import { handednessFromReflections, type Handedness } from './handedness';
import { plateGhost, type GhostRatio } from './plate-ghost';

/** Everything the planner predicts for one stack. */
export interface StackPrediction extends StackBudget {
  /** Back-surface ghost of the plate beam splitter, or null when the stack has none. */
  ghost: GhostRatio | null;
  handedness: Handedness;
  curve: ContrastPoint[];
}

/** Predicted η, τ, ghost ratio, handedness and contrast-ratio curve of a validated stack. */
export function predictStack(stack: Stack, curve: ContrastCurveOptions = {}): StackPrediction {
  const budget = stackBudget(stack);
  const splitter = stack.elements.find((e) => e.kind === 'plate-beam-splitter');
  const ghost =
    splitter && splitter.kind === 'plate-beam-splitter' && splitter.R > 0
      ? plateGhost({ R: splitter.R, T: splitter.T, angleDeg: splitter.angleDeg, n: splitter.n, back: splitter.back })
      : null;
  const display = stack.elements[0];
  const luminance = display?.kind === 'display' ? display.luminance : 0;
  return {
    ...budget,
    ghost,
    handedness: handednessFromReflections(budget.reflections),
    curve: contrastCurve(budget.eta, luminance, budget.tau, curve),
  };
}
