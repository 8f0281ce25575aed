import { assertRaster, luminanceTables } from './raster';
import type { Plane, PhotoRaster } from './types';

/**
 * Relative luminance averaged over factor × factor blocks (partial blocks at the right and bottom
 * edges are dropped). For factors above 2 only the block's diagonal is sampled, every ⌊f/2⌋ pixels:
 * this plane serves registration, detection, the ghost search and the maps, where a few samples per
 * block are enough and reading every pixel would cost as much as decoding the photo.
 */
export function downsampleLuminance(raster: PhotoRaster, factor: number): Plane {
  assertRaster(raster);
  if (!Number.isInteger(factor) || factor < 1) throw new RangeError(`factor must be a positive integer, got ${factor}`);
  const { width, height, channels, data } = raster;
  const sw = Math.max(1, Math.floor(width / factor));
  const sh = Math.max(1, Math.floor(height / factor));
  const f = Math.min(factor, width, height);
  const t = luminanceTables(raster.bitDepth, raster.encoding);
  const { r: tr, g: tg, b: tb } = t;
  const out = new Float32Array(sw * sh);
  const step = f <= 2 ? 1 : Math.floor(f / 2);
  const full = f <= 2;
  let samples = 0;
  if (full) samples = f * f;
  else for (let k = 0; k < f; k += step) samples++;
  const inv = 1 / samples;
  const stride = width * channels;
  for (let by = 0; by < sh; by++) {
    const o = by * sw;
    for (let yy = 0; yy < f; yy += full ? 1 : step) {
      const rowStart = (by * factor + yy) * stride;
      // full blocks read every column; sparse blocks read the one column on this row's diagonal
      const x0 = full ? 0 : yy;
      const x1 = full ? f : yy + 1;
      if (channels === 3 && !full) {
        // one sample per block on this row: a strided walk, no inner loop
        const q = factor * 3;
        for (let bx = 0, p = rowStart + x0 * 3; bx < sw; bx++, p += q) {
          out[o + bx] = (out[o + bx] as number) + ((tr[data[p] as number] as number) + (tg[data[p + 1] as number] as number) + (tb[data[p + 2] as number] as number));
        }
      } else if (channels === 3) {
        for (let bx = 0; bx < sw; bx++) {
          let acc = 0;
          let p = rowStart + (bx * factor + x0) * 3;
          for (let xx = x0; xx < x1; xx++, p += 3) acc += (tr[data[p] as number] as number) + (tg[data[p + 1] as number] as number) + (tb[data[p + 2] as number] as number);
          out[o + bx] = (out[o + bx] as number) + acc;
        }
      } else {
        for (let bx = 0; bx < sw; bx++) {
          let acc = 0;
          let p = rowStart + bx * factor + x0;
          for (let xx = x0; xx < x1; xx++, p++) {
            const v = data[p] as number;
            acc += (tr[v] as number) + (tg[v] as number) + (tb[v] as number);
          }
          out[o + bx] = (out[o + bx] as number) + acc;
        }
      }
    }
  }
  for (let i = 0; i < out.length; i++) out[i] = (out[i] as number) * inv;
  return { data: out, width: sw, height: sh };
}

/** Box average of a plane over factor × factor blocks (partial edge blocks dropped). */
export function boxDownsample(plane: Plane, factor: number): Plane {
  if (!Number.isInteger(factor) || factor < 1) throw new RangeError(`factor must be a positive integer, got ${factor}`);
  if (factor === 1) return { data: plane.data.slice(), width: plane.width, height: plane.height };
  const sw = Math.max(1, Math.floor(plane.width / factor));
  const sh = Math.max(1, Math.floor(plane.height / factor));
  const fx = Math.min(factor, plane.width);
  const fy = Math.min(factor, plane.height);
  const out = new Float32Array(sw * sh);
  const pd = plane.data;
  const pw = plane.width;
  for (let by = 0; by < sh; by++) {
    for (let yy = 0; yy < fy; yy++) {
      const row = (by * factor + yy) * pw;
      for (let bx = 0; bx < sw; bx++) {
        let acc = 0;
        for (let xx = 0, p = row + bx * factor; xx < fx; xx++, p++) acc += pd[p] as number;
        out[by * sw + bx] = (out[by * sw + bx] as number) + acc;
      }
    }
  }
  const inv = 1 / (fx * fy);
  for (let i = 0; i < out.length; i++) out[i] = (out[i] as number) * inv;
  return { data: out, width: sw, height: sh };
}
