import { isPatternKind, PATTERN_MAX_SIZE, PATTERN_MIN_SIZE, type PatternKind } from '@/lib/patterns';

export type SizeResult = { ok: true; width: number; height: number } | { ok: false; errors: { width?: string[]; height?: string[] } };

// Only plain digits: "1e3", "640.0" or " 640" are refused rather than guessed at.
function side(name: 'width' | 'height', raw: string | null | undefined): number | string {
  if (raw === null || raw === undefined || raw === '') return `Give the ${name} in pixels (${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE})`;
  if (!/^\d{1,6}$/.test(raw)) return `The ${name} must be a whole number of pixels (${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE})`;
  const v = Number(raw);
  if (v < PATTERN_MIN_SIZE || v > PATTERN_MAX_SIZE) return `The ${name} must be from ${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE} pixels (got ${v})`;
  return v;
}

/** Checks a requested pattern size from query text. */
export function parsePatternSize(width: string | null | undefined, height: string | null | undefined): SizeResult {
  const w = side('width', width);
  const h = side('height', height);
  if (typeof w === 'number' && typeof h === 'number') return { ok: true, width: w, height: h };
  const errors: { width?: string[]; height?: string[] } = {};
  if (typeof w === 'string') errors.width = [w];
  if (typeof h === 'string') errors.height = [h];
  return { ok: false, errors };
}

/** The kind from a route segment such as "checkerboard.png", or null. */
export function kindFromSegment(segment: string): PatternKind | null {
  const name = segment.endsWith('.png') ? segment.slice(0, -'.png'.length) : segment;
  return isPatternKind(name) ? name : null;
}

export const patternUrl = (kind: PatternKind, width: number, height: number) => `/api/patterns/${kind}.png?width=${width}&height=${height}`;

export const showUrl = (kind: PatternKind, width: number, height: number) => `/patterns/show?kind=${kind}&width=${width}&height=${height}`;

/** What each pattern is for, in the words shown beside it. */
export const PATTERN_INFO: Record<PatternKind, { name: string; use: string }> = {
  white: { name: 'Full white', use: 'Ambient contrast ratio, uniformity and ghost: the whole screen lit.' },
  black: { name: 'Full black', use: 'The display’s own black level and stray light with the panel on but dark.' },
  checkerboard: { name: '4 × 4 checkerboard', use: 'ANSI-style contrast: eight white and eight black cells measured at their centres.' },
  'checkerboard-inverse': { name: 'Inverse checkerboard', use: 'The same with the cells swapped, to average out position on the screen.' },
  uniformity: { name: '3 × 3 uniformity grid', use: 'Marks the nine points of the uniformity check on a white field.' },
  'grey-steps': { name: 'Grey steps', use: 'Camera linearity check: equal steps of linear light from black to white.' },
  orientation: { name: 'Orientation marker', use: 'Handedness: tells a normal, mirrored or rotated virtual image apart.' },
  'slanted-edge': { name: 'Slanted edge', use: 'Sharpness (MTF50): a black square turned 5° on white, its four sides measured as slanted edges.' },
};
