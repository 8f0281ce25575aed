import { assertFinite } from './assert';

/** Whether the virtual image keeps the display's handedness or is its mirror image. */
export type Handedness = 'kept' | 'mirrored';

/** Handedness after a number of plane reflections: an even count keeps it, an odd count mirrors it. */
export function handednessFromReflections(count: number): Handedness {
  // Source: each reflection reverses parity; docs/references.md birdbath notes (common practice).
  assertFinite('count', count);
  if (!Number.isInteger(count) || count < 0) throw new RangeError(`count must be a whole number ≥ 0 (got ${count})`);
  return count % 2 === 0 ? 'kept' : 'mirrored';
}
