import { checkerboardPattern } from './checkerboard';
import { greyStepsPattern } from './grey-steps';
import { orientationPattern } from './orientation';
import { slantedEdgePattern } from './slanted-edge';
import { blackPattern, whitePattern } from './solid';
import type { RgbImage } from './types';
import { uniformityPattern } from './uniformity';

/** Every pattern the app can show on a device. */
export const PATTERN_KINDS = [
  'white',
  'black',
  'checkerboard',
  'checkerboard-inverse',
  'uniformity',
  'grey-steps',
  'orientation',
  'slanted-edge',
] as const;

export type PatternKind = (typeof PATTERN_KINDS)[number];

/** Whether a string names a pattern kind (for route parameters). */
export function isPatternKind(kind: string): kind is PatternKind {
  return (PATTERN_KINDS as readonly string[]).includes(kind);
}

/** Renders a pattern of the given kind and size (16…8192 px each side) as 8-bit RGB. */
export function renderPattern(kind: PatternKind, width: number, height: number): RgbImage {
  switch (kind) {
    case 'white':
      return whitePattern(width, height);
    case 'black':
      return blackPattern(width, height);
    case 'checkerboard':
      return checkerboardPattern(width, height, false);
    case 'checkerboard-inverse':
      return checkerboardPattern(width, height, true);
    case 'uniformity':
      return uniformityPattern(width, height);
    case 'grey-steps':
      return greyStepsPattern(width, height);
    case 'orientation':
      return orientationPattern(width, height);
    case 'slanted-edge':
      return slantedEdgePattern(width, height);
    default:
      throw new RangeError(`Unknown pattern kind: ${String(kind)}`);
  }
}
