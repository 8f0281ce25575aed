import { bandRects, forEachBandPixel } from './band';
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

/** The sums of the band and its two shifted copies, gathered pixel by pixel in the band's order. */
class BandSums {
  b = 0;
  s1 = 0;
  s2 = 0;
  n = 0;
  b1 = 0;
  s11 = 0;
  n1 = 0;

  /** One band pixel: its value, and the values one and two offsets back (NaN where there is no data). */
  add(vb: number, v1: number, v2: number): void {
    if (vb !== vb || v1 !== v1) return;
    this.b1 += vb;
    this.s11 += v1;
    this.n1++;
    if (v2 !== v2) return;
    this.b += vb;
    this.s1 += v1;
    this.s2 += v2;
    this.n++;
  }

  /** A row of band pixels at once, as `add` on each in turn. */
  addRow(rb: Float64Array, r1: Float64Array, r2: Float64Array): void {
    for (let i = 0; i < rb.length; i++) this.add(rb[i] as number, r1[i] as number, r2[i] as number);
  }

  result(): GhostMeasurement | null {
    const { b, s1, s2, n, b1, s11, n1 } = this;
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
}

function checkOffset(offset: Offset): void {
  if (!Number.isInteger(offset.dx) || !Number.isInteger(offset.dy)) throw new RangeError('ghost offset must be integer');
  if (offset.dx === 0 && offset.dy === 0) throw new RangeError('ghost offset must not be zero');
}

/**
 * The same measurement on a difference read through `at(x, y)` (screen coordinates; NaN where there
 * is no data), so callers can hold only the band and its two shifted copies instead of a whole crop.
 */
export function measureGhostAt(at: (x: number, y: number) => number, screen: Rect, offset: Offset): GhostMeasurement | null {
  checkOffset(offset);
  const sums = new BandSums();
  const { dx, dy } = offset;
  forEachBandPixel(screen, offset, (x, y) => sums.add(at(x, y), at(x - dx, y - dy), at(x - 2 * dx, y - 2 * dy)));
  return sums.result();
}

/** A band rectangle moved back by k offsets and cut to the image: where it lies, and its values. */
export interface BandStrip {
  rect: Rect;
  data: Float32Array;
  /** Subtracted from `data` pixel by pixel when given (D = on − off formed only where needed). */
  minus?: Float32Array;
}

/**
 * The same measurement with the band held as strips: `strip(j, k)` is band rectangle j of
 * `bandRects(screen, offset)` moved back by k = 0, 1, 2 offsets and cut to the image (null when
 * nothing of it is left). Each pixel's three values are read by index, not looked up, and the sums
 * run in measureGhostAt's order (its rows are those of the rectangles taken from the top), so the
 * result is the one measureGhostAt gives on a reader of the same strips.
 */
export function measureGhostStrips(screen: Rect, offset: Offset, strip: (j: number, k: number) => BandStrip | null): GhostMeasurement | null {
  checkOffset(offset);
  const { dx, dy } = offset;
  const rects = bandRects(screen, offset)
    .map((rect, j) => ({ rect, j }))
    .sort((a, b) => a.rect.y - b.rect.y);
  const sums = new BandSums();
  for (const { rect: r, j } of rects) {
    const copies = [strip(j, 0), strip(j, 1), strip(j, 2)];
    const rows = [new Float64Array(r.w), new Float64Array(r.w), new Float64Array(r.w)] as const;
    for (let y = r.y; y < r.y + r.h; y++) {
      // copy k of band pixel (x, y) sits at (x − k·dx, y − k·dy) in the image
      for (let k = 0; k < 3; k++) copyRow(rows[k] as Float64Array, copies[k] ?? null, r.x - k * dx, y - k * dy);
      sums.addRow(rows[0], rows[1], rows[2]);
    }
  }
  return sums.result();
}

/** Values of a strip along image row y from column x0 on (NaN where the strip has none). */
function copyRow(out: Float64Array, c: BandStrip | null, x0: number, y: number): void {
  out.fill(Number.NaN);
  if (!c) return;
  const v = y - c.rect.y;
  if (v < 0 || v >= c.rect.h) return;
  const ua = x0 - c.rect.x;
  const t0 = Math.max(0, -ua);
  const t1 = Math.min(out.length, c.rect.w - ua);
  const base = v * c.rect.w + ua;
  const { data, minus } = c;
  if (minus) {
    for (let t = t0; t < t1; t++) out[t] = (data[base + t] as number) - (minus[base + t] as number);
  } else {
    for (let t = t0; t < t1; t++) out[t] = data[base + t] as number;
  }
}
