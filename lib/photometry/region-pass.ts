import { LUMINANCE_WEIGHTS } from './luminance';
import { assertRaster, luminanceTables } from './raster';
import type { Offset, PhotoRaster, Rect } from './types';

/** What one pass over a photo's raw pixels gathers for one rectangle (reference coordinates). */
export interface RectTotals {
  /** Σ of luminance × scale over the pixels the shifted photo has (float64, summed a row segment at a time). */
  sum: number;
  /** Pixels the shifted photo has inside the rectangle. */
  n: number;
  /** Of those, pixels with any channel at ≥ 98% of full scale. */
  clipped: number;
  /** Σ linear R, G, B (unscaled), when asked for. */
  rgb: { r: number; g: number; b: number } | null;
}

export interface RectRequest {
  rect: Rect;
  /** Also sum the linear R, G, B values (for colour means). */
  rgb?: boolean;
}

/** Mean luminance of a rectangle's totals (NaN when the photo has none of its pixels). */
export function totalsMean(t: RectTotals): number {
  return t.n === 0 ? Number.NaN : t.sum / t.n;
}

interface Segment {
  /** Columns [x0, x1) in reference coordinates. */
  x0: number;
  x1: number;
  /** Indices of the (distinct) rectangles covering these columns. */
  members: Int32Array;
  /** Whether any member also sums linear RGB. */
  rgb: boolean;
}

function sortedUnique(values: number[]): number[] {
  return [...new Set(values)].sort((a, b) => a - b);
}

// The loops over a row segment live in small functions of their own, called once per segment and
// row: V8 optimises them as whole functions after a few rows and keeps that code. Each segment's
// pixels are summed once, whatever the number of rectangles covering it, and the segment's totals
// are then added to every one of them.
const rowOut = new Float64Array(4);
// a grey pixel's luminance is its linear value times the weights' sum
const GREY_WEIGHT = LUMINANCE_WEIGHTS.r + LUMINANCE_WEIGHTS.g + LUMINANCE_WEIGHTS.b;

type Samples = Uint8Array | Uint16Array;

/** Σ luminance of RGB pixels [p, end) into out[0]; returns the clipped count. */
function rowLuminance(data: Samples, p: number, end: number, tr: Float64Array, tg: Float64Array, tb: Float64Array, clipCode: number, out: Float64Array): number {
  let s = 0;
  let c = 0;
  for (; p < end; p += 3) {
    const r = data[p] as number;
    const g = data[p + 1] as number;
    const b = data[p + 2] as number;
    s += (tr[r] as number) + (tg[g] as number) + (tb[b] as number);
    if (r >= clipCode || g >= clipCode || b >= clipCode) c++;
  }
  out[0] = s;
  return c;
}

/**
 * Σ linear R, G, B of RGB pixels [p, end) into out[1..3] and their luminance into out[0]; returns the
 * clipped count. Luminance is linear in R, G and B, so it comes from the three sums (the tables hold
 * weight × linear value) instead of a fourth lookup per pixel.
 */
function rowLuminanceRgb(data: Samples, p: number, end: number, lin: Float64Array, clipCode: number, out: Float64Array): number {
  let sr = 0;
  let sg = 0;
  let sb = 0;
  let c = 0;
  for (; p < end; p += 3) {
    const r = data[p] as number;
    const g = data[p + 1] as number;
    const b = data[p + 2] as number;
    sr += lin[r] as number;
    sg += lin[g] as number;
    sb += lin[b] as number;
    if (r >= clipCode || g >= clipCode || b >= clipCode) c++;
  }
  // ITU-R BT.709: Y = 0.2126 R + 0.7152 G + 0.0722 B
  out[0] = LUMINANCE_WEIGHTS.r * sr + LUMINANCE_WEIGHTS.g * sg + LUMINANCE_WEIGHTS.b * sb;
  out[1] = sr;
  out[2] = sg;
  out[3] = sb;
  return c;
}

/** Grey pixels [p, end): luminance into out[0] and the linear value (R = G = B) into out[1..3]; returns the clipped count. */
function rowGrey(data: Samples, p: number, end: number, lin: Float64Array, clipCode: number, out: Float64Array): number {
  let sv = 0;
  let c = 0;
  for (; p < end; p++) {
    const v = data[p] as number;
    sv += lin[v] as number;
    if (v >= clipCode) c++;
  }
  out[0] = GREY_WEIGHT * sv;
  out[1] = sv;
  out[2] = sv;
  out[3] = sv;
  return c;
}

/**
 * One pass over the raw pixels of a photo whose features sit `offset` pixels away, gathering for
 * every requested rectangle the float64 sum of luminance × scale, the pixel count, the clipped count
 * and optionally the linear RGB sums, without a full-resolution plane in memory. Each pixel is read
 * once however many rectangles cover it.
 */
export function measureRects(raster: PhotoRaster, requests: readonly RectRequest[], offset: Offset, scale: number): RectTotals[] {
  assertRaster(raster);
  if (!Number.isFinite(scale) || scale <= 0) throw new RangeError(`scale must be positive, got ${scale}`);
  if (!Number.isInteger(offset.dx) || !Number.isInteger(offset.dy)) throw new RangeError('offset must be integer');
  for (const q of requests) {
    const r = q.rect;
    if (![r.x, r.y, r.w, r.h].every(Number.isInteger) || r.w < 1 || r.h < 1) throw new RangeError('rectangles must be integers with w, h ≥ 1');
  }
  // identical rectangles are measured once
  const keyOf = (r: Rect): string => `${r.x},${r.y},${r.w},${r.h}`;
  const distinct: Rect[] = [];
  const wantRgb: boolean[] = [];
  const slot = new Map<string, number>();
  const slotOf = requests.map((q) => {
    const key = keyOf(q.rect);
    let i = slot.get(key);
    if (i === undefined) {
      i = distinct.length;
      slot.set(key, i);
      distinct.push(q.rect);
      wantRgb.push(false);
    }
    if (q.rgb) wantRgb[i] = true;
    return i;
  });
  const k = distinct.length;
  const sums = new Float64Array(k);
  const counts = new Float64Array(k);
  const clips = new Float64Array(k);
  const rgbSums = new Float64Array(3 * k);
  const { width, height, channels, data } = raster;
  const t = luminanceTables(raster.bitDepth, raster.encoding);
  const { r: tr, g: tg, b: tb, clipCode, linear: lin } = t;
  const { dx, dy } = offset;
  // bands of rows with the same covering rectangles, cut into column segments with the same members
  const ys = sortedUnique(distinct.flatMap((r) => [r.y, r.y + r.h]));
  for (let bi = 0; bi + 1 < ys.length; bi++) {
    const ya = ys[bi] as number;
    const yb = ys[bi + 1] as number;
    const cover: number[] = [];
    for (let i = 0; i < k; i++) {
      const r = distinct[i] as Rect;
      if (r.y <= ya && r.y + r.h >= yb) cover.push(i);
    }
    if (cover.length === 0) continue;
    const xs = sortedUnique(cover.flatMap((i) => [(distinct[i] as Rect).x, (distinct[i] as Rect).x + (distinct[i] as Rect).w]));
    const segments: Segment[] = [];
    for (let xi = 0; xi + 1 < xs.length; xi++) {
      const x0 = xs[xi] as number;
      const x1 = xs[xi + 1] as number;
      const members = cover.filter((i) => (distinct[i] as Rect).x <= x0 && (distinct[i] as Rect).x + (distinct[i] as Rect).w >= x1);
      if (members.length === 0) continue;
      segments.push({ x0, x1, members: Int32Array.from(members), rgb: members.some((i) => wantRgb[i]) });
    }
    for (let y = ya; y < yb; y++) {
      const sy = y + dy;
      if (sy < 0 || sy >= height) continue;
      for (const seg of segments) {
        // only the columns the shifted photo has; the others hold no data and are skipped
        const a = Math.max(seg.x0, -dx);
        const e = Math.min(seg.x1, width - dx);
        if (e <= a) continue;
        const p0 = (sy * width + a + dx) * channels;
        const p1 = (sy * width + e + dx) * channels;
        const c =
          channels === 1
            ? rowGrey(data, p0, p1, lin, clipCode, rowOut)
            : seg.rgb
              ? rowLuminanceRgb(data, p0, p1, lin, clipCode, rowOut)
              : rowLuminance(data, p0, p1, tr, tg, tb, clipCode, rowOut);
        const s = (rowOut[0] as number) * scale;
        const m = seg.members;
        for (let q = 0; q < m.length; q++) {
          const i = m[q] as number;
          sums[i] = (sums[i] as number) + s;
          counts[i] = (counts[i] as number) + (e - a);
          clips[i] = (clips[i] as number) + c;
          if (wantRgb[i]) {
            rgbSums[3 * i] = (rgbSums[3 * i] as number) + (rowOut[1] as number);
            rgbSums[3 * i + 1] = (rgbSums[3 * i + 1] as number) + (rowOut[2] as number);
            rgbSums[3 * i + 2] = (rgbSums[3 * i + 2] as number) + (rowOut[3] as number);
          }
        }
      }
    }
  }
  return slotOf.map((i, j) => ({
    sum: sums[i] as number,
    n: counts[i] as number,
    clipped: clips[i] as number,
    rgb: requests[j]?.rgb ? { r: rgbSums[3 * i] as number, g: rgbSums[3 * i + 1] as number, b: rgbSums[3 * i + 2] as number } : null,
  }));
}

/** Mean linear R, G, B of a rectangle's totals (NaN when the photo has none of its pixels), as `meanLinearRgb` gives. */
export function totalsRgbMean(t: RectTotals): { r: number; g: number; b: number; n: number } {
  if (!t.rgb) throw new RangeError('these totals were gathered without RGB sums');
  const n = t.n;
  return n === 0 ? { r: Number.NaN, g: Number.NaN, b: Number.NaN, n } : { r: t.rgb.r / n, g: t.rgb.g / n, b: t.rgb.b / n, n };
}
