import { assertRaster, luminanceTables } from './raster';
import type { Offset, PhotoRaster, Rect } from './types';

/** What one pass over a photo's raw pixels gathers for one rectangle (reference coordinates). */
export interface RectTotals {
  /** Σ of luminance × scale over the pixels the shifted photo has, each rounded to float32 as a luminance plane holds it. */
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
  /** Indices of the (distinct) rectangles covering these columns, in request order. */
  members: Int32Array;
  /** The member that also sums linear RGB, or −1. */
  rgb: number;
}

function sortedUnique(values: number[]): number[] {
  return [...new Set(values)].sort((a, b) => a - b);
}

// The two common loops live in small functions of their own, called once per row: V8 then
// optimises them as whole functions after a few rows and keeps that code, instead of replacing a
// long loop in the middle of a large function on the fly at every call (and throwing that code away
// when the code after the loop first runs).
const rowOut = new Float64Array(5);

type Samples = Uint8Array | Uint16Array;

/** Σ luminance × scale (each rounded to float32) from s0 and from s1 over RGB pixels [p, end); writes both sums to out[0..1], returns the clipped count. */
function rowLuminance(data: Samples, p: number, end: number, tr: Float32Array, tg: Float32Array, tb: Float32Array, scale: number, clipCode: number, s0: number, s1: number, out: Float64Array): number {
  let c = 0;
  for (; p < end; p += 3) {
    const r = data[p] as number;
    const g = data[p + 1] as number;
    const b = data[p + 2] as number;
    const v = Math.fround(((tr[r] as number) + (tg[g] as number) + (tb[b] as number)) * scale);
    s0 += v;
    s1 += v;
    if (r >= clipCode || g >= clipCode || b >= clipCode) c++;
  }
  out[0] = s0;
  out[1] = s1;
  return c;
}

/** As rowLuminance, also adding linear R, G, B to out[2..4]. */
function rowLuminanceRgb(data: Samples, p: number, end: number, tr: Float32Array, tg: Float32Array, tb: Float32Array, lin: Float64Array, scale: number, clipCode: number, s0: number, s1: number, out: Float64Array): number {
  let c = 0;
  let sr = out[2] as number;
  let sg = out[3] as number;
  let sb = out[4] as number;
  for (; p < end; p += 3) {
    const r = data[p] as number;
    const g = data[p + 1] as number;
    const b = data[p + 2] as number;
    const v = Math.fround(((tr[r] as number) + (tg[g] as number) + (tb[b] as number)) * scale);
    s0 += v;
    s1 += v;
    sr += lin[r] as number;
    sg += lin[g] as number;
    sb += lin[b] as number;
    if (r >= clipCode || g >= clipCode || b >= clipCode) c++;
  }
  out[0] = s0;
  out[1] = s1;
  out[2] = sr;
  out[3] = sg;
  out[4] = sb;
  return c;
}

/**
 * One pass over the raw pixels of a photo whose features sit `offset` pixels away, gathering for
 * every requested rectangle the float64 sum of luminance × scale, the pixel count, the clipped count
 * and optionally the linear RGB sums. Each pixel's luminance is rounded to float32 (the value
 * `luminanceCrop` would hold) and added to each covering rectangle's sum in row-major order, so the
 * sums equal `regionSum` over a crop bit for bit, without a full-resolution plane in memory.
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
      const rgbMembers = members.filter((i) => wantRgb[i]);
      segments.push({ x0, x1, members: Int32Array.from(members), rgb: rgbMembers.length === 1 ? (rgbMembers[0] as number) : rgbMembers.length === 0 ? -1 : -2 });
    }
    for (let y = ya; y < yb; y++) {
      const sy = y + dy;
      if (sy < 0 || sy >= height) continue;
      for (const seg of segments) {
        // only the columns the shifted photo has; the others hold no data and are skipped
        const a = Math.max(seg.x0, -dx);
        const e = Math.min(seg.x1, width - dx);
        if (e <= a) continue;
        const m = seg.members;
        const mc = m.length;
        const i0 = m[0] as number;
        const i1 = mc > 1 ? (m[1] as number) : -1;
        for (let q = 0; q < mc; q++) counts[m[q] as number] = (counts[m[q] as number] as number) + (e - a);
        let c = 0;
        if (channels === 3 && seg.rgb === -1 && mc <= 2) {
          const p0 = (sy * width + a + dx) * 3;
          c = rowLuminance(data, p0, (sy * width + e + dx) * 3, tr, tg, tb, scale, clipCode, sums[i0] as number, i1 >= 0 ? (sums[i1] as number) : 0, rowOut);
          sums[i0] = rowOut[0] as number;
          if (i1 >= 0) sums[i1] = rowOut[1] as number;
        } else if (channels === 3 && seg.rgb >= 0 && mc <= 2) {
          const ri = seg.rgb;
          rowOut[2] = rgbSums[3 * ri] as number;
          rowOut[3] = rgbSums[3 * ri + 1] as number;
          rowOut[4] = rgbSums[3 * ri + 2] as number;
          const p0 = (sy * width + a + dx) * 3;
          c = rowLuminanceRgb(data, p0, (sy * width + e + dx) * 3, tr, tg, tb, lin, scale, clipCode, sums[i0] as number, i1 >= 0 ? (sums[i1] as number) : 0, rowOut);
          sums[i0] = rowOut[0] as number;
          if (i1 >= 0) sums[i1] = rowOut[1] as number;
          rgbSums[3 * ri] = rowOut[2] as number;
          rgbSums[3 * ri + 1] = rowOut[3] as number;
          rgbSums[3 * ri + 2] = rowOut[4] as number;
        } else {
          // any number of members, grey or colour: the general (slower) loop
          const stride = channels;
          for (let p = (sy * width + a + dx) * stride, end = (sy * width + e + dx) * stride; p < end; p += stride) {
            const r = data[p] as number;
            const g = stride === 3 ? (data[p + 1] as number) : r;
            const b = stride === 3 ? (data[p + 2] as number) : r;
            const v = Math.fround(((tr[r] as number) + (tg[g] as number) + (tb[b] as number)) * scale);
            for (let q = 0; q < mc; q++) {
              const i = m[q] as number;
              sums[i] = (sums[i] as number) + v;
              if (wantRgb[i]) {
                rgbSums[3 * i] = (rgbSums[3 * i] as number) + (lin[r] as number);
                rgbSums[3 * i + 1] = (rgbSums[3 * i + 1] as number) + (lin[g] as number);
                rgbSums[3 * i + 2] = (rgbSums[3 * i + 2] as number) + (lin[b] as number);
              }
            }
            if (r >= clipCode || g >= clipCode || b >= clipCode) c++;
          }
        }
        for (let q = 0; q < mc; q++) clips[m[q] as number] = (clips[m[q] as number] as number) + c;
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
