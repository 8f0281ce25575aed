import { bandRects, forEachBandPixel, ghostBandRects } from './band';
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

/** The ghost measured on its band's plateau against the mirrored band (see `measureGhostOneSided`). */
export interface OneSidedGhost extends GhostMeasurement {
  /** Mean D over the band at the offset and over the mirrored band (offset −d). */
  band: number;
  mirror: number;
  /** Mirrored-band pixels used. */
  nMirror: number;
  /** (band − mirror) over its standard error, from the scatter of the mirrored band's 16 × 16 px block means. */
  snr: number;
  /** Share of the band's light that is one-sided: (band − mirror) / band. */
  oneSided: number;
}

const BLOCK = 16;

/** Mean and scatter of the block means of a crop (blocks of BLOCK × BLOCK px, NaN skipped). */
function addBlocks(data: Float32Array, w: number, h: number, out: number[]): void {
  for (let by = 0; by < h; by += BLOCK) {
    for (let bx = 0; bx < w; bx += BLOCK) {
      let s = 0;
      let n = 0;
      for (let y = by; y < Math.min(h, by + BLOCK); y++) {
        for (let x = bx; x < Math.min(w, bx + BLOCK); x++) {
          const v = data[y * w + x] as number;
          if (v === v) { s += v; n++; }
        }
      }
      // blocks cut to a sliver by the band's border say little about the scatter
      if (n >= (BLOCK * BLOCK) / 4) out.push(s / n);
    }
  }
}

function variance(xs: number[]): number {
  if (xs.length < 2) return Number.NaN;
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1);
}

/**
 * Second-order ghost ratio on the band's plateau, against the mirrored band (docs/method.md §5.8).
 * `read(rect)` gives the difference D (on − off, or the dark photo) over a rectangle in on-photo
 * coordinates, NaN where there is no data. The band is `ghostBandRects(screen, offset, zone)`: the
 * displaced screen shrunk by the edge zone, minus the screen grown by it, so neither the screen's
 * spill nor the ghost's own soft edge is in it. B is the mean of D there minus the mean over the
 * mirrored band (offset −d), which carries the light blur and stray light put on every side alike;
 * S1, S2 are the means over the band moved back by one and two offsets, pixel for pixel, and
 * B = g·S1 − g²·S2 gives g. With `background` (the mean of D far from the display), only the
 * mirror's excess over it comes off B. Null when the band or the screen has no data or no light.
 */
export function measureGhostOneSided(read: (r: Rect) => Float32Array, screen: Rect, offset: Offset, zone: number, background: number | null = null): OneSidedGhost | null {
  checkOffset(offset);
  const { dx, dy } = offset;
  const rects = ghostBandRects(screen, offset, zone);
  const mirrorRects = ghostBandRects(screen, { dx: -dx, dy: -dy }, zone);
  if (rects.length === 0 || mirrorRects.length === 0) return null;
  const sums = new BandSums();
  let bandSum = 0;
  let bandN = 0;
  const bandBlocks: number[] = [];
  for (const r of rects) {
    const b = read(r);
    const s1 = read({ x: r.x - dx, y: r.y - dy, w: r.w, h: r.h });
    const s2 = read({ x: r.x - 2 * dx, y: r.y - 2 * dy, w: r.w, h: r.h });
    for (let i = 0; i < b.length; i++) {
      const v = b[i] as number;
      sums.add(v, s1[i] as number, s2[i] as number);
      if (v === v) { bandSum += v; bandN++; }
    }
    addBlocks(b, r.w, r.h, bandBlocks);
  }
  let mirrorSum = 0;
  let mirrorN = 0;
  const mirrorBlocks: number[] = [];
  for (const r of mirrorRects) {
    const m = read(r);
    for (let i = 0; i < m.length; i++) {
      const v = m[i] as number;
      if (v === v) { mirrorSum += v; mirrorN++; }
    }
    addBlocks(m, r.w, r.h, mirrorBlocks);
  }
  if (bandN === 0 || mirrorN === 0) return null;
  const band = bandSum / bandN;
  const mirror = mirrorSum / mirrorN;
  // the band's and the mirror's means move together with the light the screen spreads alike on every side
  const raw = sums.result();
  if (!raw) return null;
  const excess = band - mirror;
  // B is taken over the pixels with data one (and two) offsets back. What comes off it is the light
  // the mirrored band holds above the frame's far background (when known): the halo the screen
  // spreads on every side alike. A dark photo's near-black background reads a little high (noise
  // clipped at zero); measured against the far background, that offset does not come off the ghost.
  const b = raw.b - (background === null || !Number.isFinite(background) ? mirror : mirror - background);
  const ratio = Number.isFinite(raw.s2) ? solveGhostRatio(b, raw.s1, raw.s2) : b / raw.s1;
  // the scatter of the mirrored band's block means (noise, the room's residue, no ghost) stands for
  // both sides: the band's own blocks also vary with the ghost's pattern, which is signal
  const se = Math.sqrt(variance(mirrorBlocks) * (1 / Math.max(1, bandBlocks.length) + 1 / Math.max(1, mirrorBlocks.length)));
  // a band too thin for blocks gives no scatter: no ghost can be told apart there
  const snr = se > 0 ? excess / se : 0;
  return { ratio, firstOrder: b / raw.s1, b, s1: raw.s1, s2: raw.s2, n: raw.n, band, mirror, nMirror: mirrorN, snr, oneSided: band > 0 ? excess / band : 0 };
}
