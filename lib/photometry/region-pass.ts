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

/**
 * One row-by-row pass over the raw pixels of a photo whose features sit `offset` pixels away,
 * gathering for every requested rectangle the float64 sum of luminance × scale, the pixel count,
 * the clipped count and optionally the linear RGB sums. Each row's luminance is computed once into
 * a float32 row (the values `luminanceCrop` would hold) and every rectangle sums its own segment of
 * it in row-major order, so the sums equal `regionSum` over a crop bit for bit, without a
 * full-resolution plane in memory.
 */
export function measureRects(raster: PhotoRaster, requests: readonly RectRequest[], offset: Offset, scale: number): RectTotals[] {
  assertRaster(raster);
  if (!Number.isFinite(scale) || scale <= 0) throw new RangeError(`scale must be positive, got ${scale}`);
  if (!Number.isInteger(offset.dx) || !Number.isInteger(offset.dy)) throw new RangeError('offset must be integer');
  for (const q of requests) {
    const r = q.rect;
    if (![r.x, r.y, r.w, r.h].every(Number.isInteger) || r.w < 1 || r.h < 1) throw new RangeError('rectangles must be integers with w, h ≥ 1');
  }
  const { width, height, channels, data } = raster;
  const t = luminanceTables(raster.bitDepth, raster.encoding);
  const { r: tr, g: tg, b: tb, clipCode, linear: lin } = t;
  const k = requests.length;
  const sums = new Float64Array(k);
  const counts = new Float64Array(k);
  const clips = new Float64Array(k);
  const rgbSums = new Float64Array(3 * k);
  const out: RectTotals[] = [];
  if (k === 0) return out;
  let y0 = Infinity;
  let y1 = -Infinity;
  let x0 = Infinity;
  let x1 = -Infinity;
  for (const q of requests) {
    y0 = Math.min(y0, q.rect.y);
    y1 = Math.max(y1, q.rect.y + q.rect.h);
    x0 = Math.min(x0, q.rect.x);
    x1 = Math.max(x1, q.rect.x + q.rect.w);
  }
  const rw = x1 - x0;
  const row = new Float32Array(rw);
  const clipRow = new Uint8Array(rw);
  const rx0 = new Int32Array(k);
  const rx1 = new Int32Array(k);
  const ry0 = new Int32Array(k);
  const ry1 = new Int32Array(k);
  const wantRgb = new Uint8Array(k);
  for (let i = 0; i < k; i++) {
    const q = requests[i] as RectRequest;
    rx0[i] = q.rect.x;
    rx1[i] = q.rect.x + q.rect.w;
    ry0[i] = q.rect.y;
    ry1[i] = q.rect.y + q.rect.h;
    wantRgb[i] = q.rgb ? 1 : 0;
  }
  const { dx, dy } = offset;
  for (let y = y0; y < y1; y++) {
    const sy = y + dy;
    if (sy < 0 || sy >= height) continue;
    // the columns this row needs: the union of the covering rectangles' spans
    let cx0 = x1;
    let cx1 = x0;
    for (let i = 0; i < k; i++) {
      if (y < (ry0[i] as number) || y >= (ry1[i] as number)) continue;
      if ((rx0[i] as number) < cx0) cx0 = rx0[i] as number;
      if ((rx1[i] as number) > cx1) cx1 = rx1[i] as number;
    }
    if (cx1 <= cx0) continue;
    // only the columns the shifted photo has; the others hold no data and are skipped
    const sx0 = Math.max(0, cx0 + dx);
    const sx1 = Math.min(width, cx1 + dx);
    if (sx1 <= sx0) continue;
    const v0 = sx0 - dx;
    const v1 = sx1 - dx;
    let o = v0 - x0;
    if (channels === 3) {
      for (let p = (sy * width + sx0) * 3, end = (sy * width + sx1) * 3; p < end; p += 3, o++) {
        const r = data[p] as number;
        const g = data[p + 1] as number;
        const b = data[p + 2] as number;
        row[o] = ((tr[r] as number) + (tg[g] as number) + (tb[b] as number)) * scale;
        clipRow[o] = r >= clipCode || g >= clipCode || b >= clipCode ? 1 : 0;
      }
    } else {
      for (let p = sy * width + sx0, end = sy * width + sx1; p < end; p++, o++) {
        const v = data[p] as number;
        row[o] = ((tr[v] as number) + (tg[v] as number) + (tb[v] as number)) * scale;
        clipRow[o] = v >= clipCode ? 1 : 0;
      }
    }
    for (let i = 0; i < k; i++) {
      if (y < (ry0[i] as number) || y >= (ry1[i] as number)) continue;
      const a = Math.max(rx0[i] as number, v0);
      const e = Math.min(rx1[i] as number, v1);
      if (e <= a) continue;
      let s = sums[i] as number;
      let c = 0;
      for (let j = a - x0, je = e - x0; j < je; j++) {
        s += row[j] as number;
        c += clipRow[j] as number;
      }
      sums[i] = s;
      counts[i] = (counts[i] as number) + (e - a);
      clips[i] = (clips[i] as number) + c;
      if (wantRgb[i] === 1) {
        let sr = rgbSums[3 * i] as number;
        let sg = rgbSums[3 * i + 1] as number;
        let sb = rgbSums[3 * i + 2] as number;
        if (channels === 3) {
          for (let p = (sy * width + a + dx) * 3, end = (sy * width + e + dx) * 3; p < end; p += 3) {
            sr += lin[data[p] as number] as number;
            sg += lin[data[p + 1] as number] as number;
            sb += lin[data[p + 2] as number] as number;
          }
        } else {
          for (let p = sy * width + a + dx, end = sy * width + e + dx; p < end; p++) {
            const v = lin[data[p] as number] as number;
            sr += v;
            sg += v;
            sb += v;
          }
        }
        rgbSums[3 * i] = sr;
        rgbSums[3 * i + 1] = sg;
        rgbSums[3 * i + 2] = sb;
      }
    }
  }
  for (let i = 0; i < k; i++) {
    out.push({
      sum: sums[i] as number,
      n: counts[i] as number,
      clipped: clips[i] as number,
      rgb: wantRgb[i] === 1 ? { r: rgbSums[3 * i] as number, g: rgbSums[3 * i + 1] as number, b: rgbSums[3 * i + 2] as number } : null,
    });
  }
  return out;
}

/** Mean linear R, G, B of a rectangle's totals (NaN when the photo has none of its pixels), as `meanLinearRgb` gives. */
export function totalsRgbMean(t: RectTotals): { r: number; g: number; b: number; n: number } {
  if (!t.rgb) throw new RangeError('these totals were gathered without RGB sums');
  const n = t.n;
  return n === 0 ? { r: Number.NaN, g: Number.NaN, b: Number.NaN, n } : { r: t.rgb.r / n, g: t.rgb.g / n, b: t.rgb.b / n, n };
}
