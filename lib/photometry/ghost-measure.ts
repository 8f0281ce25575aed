import { forEachBandPixel } from './band';
import { solveGhostRatio } from './ghost-ratio';
import type { Offset, Plane, Rect } from './types';

export interface GhostMeasurement {
  ratio: number;
  firstOrder: number;
  b: number;
  s1: number;
  s2: number;
  /** Band pixels used (those with data one and two offsets back). */
  n: number;
}

/**
 * Second-order ghost ratio from a difference plane (d, or d − minus) whose pixel (0, 0) sits at `origin` in screen
 * coordinates: B over the band (the displaced screen minus the screen), S1 and S2 over the band
 * shifted back by one and two offsets. Null when the band has no data or the screen no light.
 */
export function measureGhost(d: Plane, origin: { x: number; y: number }, screen: Rect, offset: Offset, minus?: Plane): GhostMeasurement | null {
  if (minus && (minus.width !== d.width || minus.height !== d.height)) throw new RangeError('planes must have the same size');
  if (!Number.isInteger(offset.dx) || !Number.isInteger(offset.dy)) throw new RangeError('ghost offset must be integer');
  if (offset.dx === 0 && offset.dy === 0) throw new RangeError('ghost offset must not be zero');
  const at = (x: number, y: number): number => {
    const u = x - origin.x;
    const v = y - origin.y;
    if (u < 0 || v < 0 || u >= d.width || v >= d.height) return Number.NaN;
    const i = v * d.width + u;
    // with `minus`, D = d − minus is formed only where the band needs it
    return minus ? (d.data[i] as number) - (minus.data[i] as number) : (d.data[i] as number);
  };
  return measureGhostAt(at, screen, offset);
}

/**
 * The same measurement on a difference read through `at(x, y)` (screen coordinates; NaN where there
 * is no data), so callers can hold only the band and its two shifted copies instead of a whole crop.
 */
export function measureGhostAt(at: (x: number, y: number) => number, screen: Rect, offset: Offset): GhostMeasurement | null {
  if (!Number.isInteger(offset.dx) || !Number.isInteger(offset.dy)) throw new RangeError('ghost offset must be integer');
  if (offset.dx === 0 && offset.dy === 0) throw new RangeError('ghost offset must not be zero');
  let b = 0;
  let s1 = 0;
  let s2 = 0;
  let n = 0;
  let b1 = 0;
  let s11 = 0;
  let n1 = 0;
  forEachBandPixel(screen, offset, (x, y) => {
    const vb = at(x, y);
    const v1 = at(x - offset.dx, y - offset.dy);
    if (vb !== vb || v1 !== v1) return;
    b1 += vb;
    s11 += v1;
    n1++;
    const v2 = at(x - 2 * offset.dx, y - 2 * offset.dy);
    if (v2 !== v2) return;
    b += vb;
    s1 += v1;
    s2 += v2;
    n++;
  });
  // where two offsets back leaves the image, keep the first-order estimate on the larger set
  if (n < 0.5 * n1) {
    if (n1 === 0 || s11 <= 0) return null;
    const r = b1 / s11;
    return { ratio: r, firstOrder: r, b: b1 / n1, s1: s11 / n1, s2: Number.NaN, n: n1 };
  }
  if (n === 0 || s1 <= 0) return null;
  const mb = b / n;
  const m1 = s1 / n;
  const m2 = s2 / n;
  return { ratio: solveGhostRatio(mb, m1, m2), firstOrder: mb / m1, b: mb, s1: m1, s2: m2, n };
}
