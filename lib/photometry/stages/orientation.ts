import { detectOrientation } from '../orientation';
import type { EngineWarning, OrientationResult } from '../result';
import type { Pattern } from '../types';
import type { Aligned } from './align';
import type { Normalised } from './normalise';

/** Below this margin between the best and the runner-up transform the photo does not tell them apart. */
export const ORIENTATION_MIN_MARGIN = 0.1;

/**
 * How the orientation marker (lib/patterns/orientation.ts) arrived at the camera, with pattern
 * orientation: the display's light alone (on − off, aligned, on the downsampled grid) over the
 * screen, correlated with the marker as sent, mirrored, flipped and turned (docs/method.md §5.13).
 * Null for other patterns, or when the screen is too small on the grid to read the marker.
 */
export function readOrientation(n: Normalised, a: Aligned, pattern: Pattern, warnings: EngineWarning[]): OrientationResult | null {
  if (pattern !== 'orientation') return null;
  const f = n.factor;
  const plane = a.diffSmall;
  const x = Math.max(0, Math.ceil(a.screen.x / f));
  const y = Math.max(0, Math.ceil(a.screen.y / f));
  const w = Math.min(plane.width - x, Math.floor((a.screen.x + a.screen.w) / f) - x);
  const h = Math.min(plane.height - y, Math.floor((a.screen.y + a.screen.h) / f) - y);
  if (w < 16 || h < 16) {
    warnings.push({ code: 'orientation-unclear', message: 'no orientation reading: the screen is too small in the photo to read the marker; fill more of the frame with the screen' });
    return null;
  }
  const r = detectOrientation(plane, { x, y, w, h });
  if (!Number.isFinite(r.margin) || !Object.values(r.scores).every(Number.isFinite)) {
    warnings.push({ code: 'orientation-unclear', message: 'no orientation reading: the screen shows no marker (a plain screen?); show the orientation pattern full screen' });
    return null;
  }
  const margin = Math.round(r.margin * 1000) / 1000;
  if (margin < ORIENTATION_MIN_MARGIN) {
    warnings.push({ code: 'orientation-unclear', message: `the orientation marker reads as ${r.orientation} by a margin of only ${margin.toFixed(2)}: show the orientation pattern full screen, in focus, and mark the screen region` });
  }
  const round = (v: number) => Math.round(v * 1000) / 1000;
  return {
    orientation: r.orientation,
    mirrored: r.mirrored,
    margin,
    scores: { normal: round(r.scores.normal), mirrored: round(r.scores.mirrored), 'upside-down-mirrored': round(r.scores['upside-down-mirrored']), 'rotated-180': round(r.scores['rotated-180']) },
  };
}
