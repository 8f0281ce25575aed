import { assertRaster, luminanceTables } from './raster';
import type { Offset, Plane, PhotoRaster, Rect } from './types';

export interface LuminanceCrop {
  /** Relative luminance × scale at full resolution; NaN where the shifted photo has no pixel. */
  plane: Plane;
  /** 1 where any channel is at ≥ 98% of full scale. */
  clipped: Uint8Array;
  /** The crop's rectangle in the reference photo's coordinates. */
  rect: Rect;
}

/**
 * Full-resolution luminance of `rect` (reference coordinates) read from a photo whose features sit
 * `offset` pixels away, multiplied by `scale` (the exposure normalisation).
 */
export function luminanceCrop(raster: PhotoRaster, rect: Rect, offset: Offset, scale: number): LuminanceCrop {
  assertRaster(raster);
  if (!Number.isFinite(scale) || scale <= 0) throw new RangeError(`scale must be positive, got ${scale}`);
  if (![rect.x, rect.y, rect.w, rect.h, offset.dx, offset.dy].every(Number.isInteger) || rect.w < 1 || rect.h < 1) {
    throw new RangeError('crop rectangle and offset must be integers with w, h ≥ 1');
  }
  const { width, height, channels, data } = raster;
  const t = luminanceTables(raster.bitDepth, raster.encoding);
  const { r: tr, g: tg, b: tb, clipCode } = t;
  const out = new Float32Array(rect.w * rect.h).fill(Number.NaN);
  const clipped = new Uint8Array(rect.w * rect.h);
  for (let j = 0; j < rect.h; j++) {
    const sy = rect.y + j + offset.dy;
    if (sy < 0 || sy >= height) continue;
    const sx0 = Math.max(0, rect.x + offset.dx);
    const sx1 = Math.min(width, rect.x + rect.w + offset.dx);
    let o = j * rect.w + (sx0 - rect.x - offset.dx);
    if (channels === 3) {
      for (let sx = sx0, p = (sy * width + sx0) * 3; sx < sx1; sx++, p += 3, o++) {
        const r = data[p] as number;
        const g = data[p + 1] as number;
        const b = data[p + 2] as number;
        out[o] = ((tr[r] as number) + (tg[g] as number) + (tb[b] as number)) * scale;
        if (r >= clipCode || g >= clipCode || b >= clipCode) clipped[o] = 1;
      }
    } else {
      for (let sx = sx0, p = sy * width + sx0; sx < sx1; sx++, p++, o++) {
        const v = data[p] as number;
        out[o] = ((tr[v] as number) + (tg[v] as number) + (tb[v] as number)) * scale;
        if (v >= clipCode) clipped[o] = 1;
      }
    }
  }
  return { plane: { data: out, width: rect.w, height: rect.h }, clipped, rect };
}

/** Mean linear R, G, B of `rect` (reference coordinates) in a photo shifted by `offset`; pixels outside are skipped. */
export function meanLinearRgb(raster: PhotoRaster, rect: Rect, offset: Offset): { r: number; g: number; b: number; n: number } {
  assertRaster(raster);
  const lin = luminanceTables(raster.bitDepth, raster.encoding).linear;
  const { width, height, channels, data } = raster;
  let r = 0;
  let g = 0;
  let b = 0;
  let n = 0;
  for (let y = rect.y + offset.dy; y < rect.y + rect.h + offset.dy; y++) {
    if (y < 0 || y >= height) continue;
    const x0 = Math.max(0, rect.x + offset.dx);
    const x1 = Math.min(width, rect.x + rect.w + offset.dx);
    for (let x = x0; x < x1; x++) {
      const p = (y * width + x) * channels;
      if (channels === 3) {
        r += lin[data[p] as number] as number;
        g += lin[data[p + 1] as number] as number;
        b += lin[data[p + 2] as number] as number;
      } else {
        const v = lin[data[p] as number] as number;
        r += v;
        g += v;
        b += v;
      }
      n++;
    }
  }
  return n === 0 ? { r: Number.NaN, g: Number.NaN, b: Number.NaN, n } : { r: r / n, g: g / n, b: b / n, n };
}
