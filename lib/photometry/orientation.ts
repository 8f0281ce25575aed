import { orientationPattern } from '../patterns/orientation';
import { assertRectInside } from './rect';
import type { Plane, Rect } from './types';

export type Orientation = 'normal' | 'mirrored' | 'upside-down-mirrored' | 'rotated-180';

export interface OrientationReading {
  /** The transform that maps the pattern as sent onto what the camera saw. */
  orientation: Orientation;
  /** True when the image is mirror-reversed (an odd number of reflections). */
  mirrored: boolean;
  /** Pearson correlation of the seen screen with each transformed copy of the pattern. */
  scores: Record<Orientation, number>;
  /** Best score minus the runner-up: small margins mean the photo does not tell. */
  margin: number;
}

const GRID = 64;

// Flips are applied to the reference, so each candidate says what happened on the way to the eye.
const TRANSFORMS: Record<Orientation, (x: number, y: number, w: number, h: number) => number> = {
  normal: (x, y, w) => y * w + x,
  mirrored: (x, y, w) => y * w + (w - 1 - x),
  'upside-down-mirrored': (x, y, w, h) => (h - 1 - y) * w + x,
  'rotated-180': (x, y, w, h) => (h - 1 - y) * w + (w - 1 - x),
};

/** Mean of `plane` over each cell of a gw × gh grid laid on `r` (Float64 sums). */
function gridMeans(plane: Plane, r: Rect, gw: number, gh: number): Float64Array {
  const out = new Float64Array(gw * gh);
  const count = new Float64Array(gw * gh);
  for (let y = r.y; y < r.y + r.h; y++) {
    const gy = Math.min(gh - 1, Math.floor(((y - r.y) * gh) / r.h));
    const row = y * plane.width;
    for (let x = r.x; x < r.x + r.w; x++) {
      const gx = Math.min(gw - 1, Math.floor(((x - r.x) * gw) / r.w));
      out[gy * gw + gx]! += plane.data[row + x]!;
      count[gy * gw + gx]! += 1;
    }
  }
  for (let i = 0; i < out.length; i++) out[i] = count[i]! > 0 ? out[i]! / count[i]! : 0;
  return out;
}

function pearson(a: Float64Array, b: Float64Array): number {
  let ma = 0;
  let mb = 0;
  for (let i = 0; i < a.length; i++) {
    ma += a[i]!;
    mb += b[i]!;
  }
  ma /= a.length;
  mb /= b.length;
  let sab = 0;
  let saa = 0;
  let sbb = 0;
  for (let i = 0; i < a.length; i++) {
    const da = a[i]! - ma;
    const db = b[i]! - mb;
    sab += da * db;
    saa += da * da;
    sbb += db * db;
  }
  return saa > 0 && sbb > 0 ? sab / Math.sqrt(saa * sbb) : 0;
}

/**
 * Tells from a photo of the orientation test pattern whether the virtual image reaches the eye
 * as sent, mirror-reversed or turned: the screen is averaged onto a coarse grid and correlated
 * with the pattern under each flip. Works on linear luminance (or D = on − off) inside `screen`.
 */
export function detectOrientation(plane: Plane, screen: Rect): OrientationReading {
  assertRectInside(screen, plane.width, plane.height);
  if (screen.w < 16 || screen.h < 16) throw new RangeError('the screen must be at least 16 × 16 px to read the orientation pattern');
  const gw = GRID;
  const gh = Math.max(16, Math.round((GRID * screen.h) / screen.w));
  const seen = gridMeans(plane, screen, gw, gh);
  const pattern = orientationPattern(gw, gh);
  const scores = {} as Record<Orientation, number>;
  for (const [name, index] of Object.entries(TRANSFORMS) as [Orientation, (typeof TRANSFORMS)[Orientation]][]) {
    const ref = new Float64Array(gw * gh);
    for (let y = 0; y < gh; y++) for (let x = 0; x < gw; x++) ref[index(x, y, gw, gh)] = pattern.data[(y * gw + x) * 3]! / 255;
    scores[name] = pearson(seen, ref);
  }
  const ranked = (Object.keys(scores) as Orientation[]).sort((a, b) => scores[b] - scores[a]);
  const best = ranked[0]!;
  return { orientation: best, mirrored: best === 'mirrored' || best === 'upside-down-mirrored', scores, margin: scores[best] - scores[ranked[1]!] };
}
