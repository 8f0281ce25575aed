import { luminanceCrop } from './crop';
import { offsetAt, type Motion } from './motion';
import type { Plane, PhotoRaster, Rect } from './types';

/**
 * Bilinear sample of `p` at (x, y) (pixel centres at integers); NaN outside or next to NaN.
 * Used to bring a photo that moved by a fraction of a pixel, or turned a little, onto the on
 * photo's grid instead of rounding its shift.
 */
function sample(p: Plane, x: number, y: number): number {
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  const fx = x - x0;
  const fy = y - y0;
  const { width: w, height: h, data } = p;
  // a weight of zero lets the sample sit on the last row or column
  const x1 = fx > 0 ? x0 + 1 : x0;
  const y1 = fy > 0 ? y0 + 1 : y0;
  if (x0 < 0 || y0 < 0 || x1 >= w || y1 >= h) return Number.NaN;
  const a = data[y0 * w + x0] as number;
  const b = data[y0 * w + x1] as number;
  const c = data[y1 * w + x0] as number;
  const d = data[y1 * w + x1] as number;
  return (1 - fy) * ((1 - fx) * a + fx * b) + fy * ((1 - fx) * c + fx * d);
}

/**
 * out(p) = plane(position of p's feature in the plane under `m`): the plane brought onto the
 * reference grid, NaN where that falls outside. Whole-pixel translations copy values exactly.
 */
export function warpPlane(plane: Plane, m: Motion): Plane {
  const { width: w, height: h } = plane;
  const out = new Float32Array(w * h);
  if (m.angle === 0 && Number.isInteger(m.dx) && Number.isInteger(m.dy)) {
    out.fill(Number.NaN);
    for (let y = 0; y < h; y++) {
      const sy = y + m.dy;
      if (sy < 0 || sy >= h) continue;
      const x0 = Math.max(0, -m.dx);
      const x1 = Math.min(w, w - m.dx);
      if (x1 > x0) out.set(plane.data.subarray(sy * w + x0 + m.dx, sy * w + x1 + m.dx), y * w + x0);
    }
    return { data: out, width: w, height: h };
  }
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const o = offsetAt(m, x, y);
      out[y * w + x] = sample(plane, x + o.dx, y + o.dy);
    }
  }
  return { data: out, width: w, height: h };
}

/**
 * Full-resolution luminance × scale of `rect` (on-photo coordinates) from a photo that moved by `m`,
 * interpolated bilinearly where the motion is not a whole-pixel translation; NaN where the photo
 * has no pixel. Reads only the source window the rectangle maps to.
 */
export function warpedCrop(raster: PhotoRaster, rect: Rect, m: Motion, scale: number): Plane {
  const corners = [
    offsetAt(m, rect.x, rect.y),
    offsetAt(m, rect.x + rect.w - 1, rect.y),
    offsetAt(m, rect.x, rect.y + rect.h - 1),
    offsetAt(m, rect.x + rect.w - 1, rect.y + rect.h - 1),
  ];
  const whole = corners.every((o) => Number.isInteger(o.dx) && Number.isInteger(o.dy) && o.dx === corners[0]?.dx && o.dy === corners[0]?.dy);
  if (whole) return luminanceCrop(raster, rect, corners[0] as { dx: number; dy: number }, scale).plane;
  const minDx = Math.floor(Math.min(...corners.map((o) => o.dx)));
  const maxDx = Math.ceil(Math.max(...corners.map((o) => o.dx)));
  const minDy = Math.floor(Math.min(...corners.map((o) => o.dy)));
  const maxDy = Math.ceil(Math.max(...corners.map((o) => o.dy)));
  // the source window, in on-photo coordinates read with a zero offset
  const src: Rect = { x: rect.x + minDx, y: rect.y + minDy, w: rect.w + maxDx - minDx + 1, h: rect.h + maxDy - minDy + 1 };
  const window = luminanceCrop(raster, src, { dx: 0, dy: 0 }, scale).plane;
  const out = new Float32Array(rect.w * rect.h);
  for (let j = 0; j < rect.h; j++) {
    const y = rect.y + j;
    for (let i = 0; i < rect.w; i++) {
      const x = rect.x + i;
      const o = offsetAt(m, x, y);
      out[j * rect.w + i] = sample(window, x + o.dx - src.x, y + o.dy - src.y);
    }
  }
  return { data: out, width: rect.w, height: rect.h };
}
