import type { Stack } from '../schemas/stack';

/** How the display's light is folded into the eye. */
export type StackLayout =
  | { kind: 'single-combiner'; reflectorIndex: number }
  | { kind: 'birdbath'; splitterIndex: number; combinerIndex: number };

/**
 * Layout of a stack: one reflecting element (a plate beam splitter or a combiner) is a single
 * combiner; a splitter followed by a combiner is a birdbath. Throws RangeError otherwise.
 */
export function detectLayout(stack: Stack): StackLayout {
  const splitters: number[] = [];
  const combiners: number[] = [];
  stack.elements.forEach((e, i) => {
    if (e.kind === 'plate-beam-splitter') splitters.push(i);
    if (e.kind === 'combiner') combiners.push(i);
  });
  const [s] = splitters;
  const [c] = combiners;
  if (splitters.length === 1 && combiners.length === 1 && s !== undefined && c !== undefined && s < c) {
    return { kind: 'birdbath', splitterIndex: s, combinerIndex: c };
  }
  if (splitters.length + combiners.length === 1) {
    const only = s ?? c;
    if (only !== undefined) return { kind: 'single-combiner', reflectorIndex: only };
  }
  throw new RangeError(
    'Unsupported layout: use one reflecting element (single combiner) or a splitter followed by a combiner (birdbath)',
  );
}

/** Number of reflections the display's light makes on its way to the eye. */
export function reflectionCount(layout: StackLayout): number {
  return layout.kind === 'birdbath' ? 2 : 1;
}
