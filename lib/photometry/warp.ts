import { luminanceCrop } from './crop';
import { offsetAt, type Motion } from './motion';
import type { Plane, PhotoRaster, Rect } from './types';

/**
 * out(p) = plane(position of p's feature in the plane under `m`): the plane brought onto the
 * reference grid, NaN where that falls outside. Whole-pixel translations copy values exactly.
 */
/**
 * The whole-pixel translation a motion stands for when it is one to within 0.02 px over an extent
 * (the largest distance from the motion's centre that is read), else null. Reading such a motion
 * by interpolation would cost more and change nothing that can be measured.
 */
export function wholeShift(m: Motion, extent: number): { dx: number; dy: number } | null {
  const dx = Math.round(m.dx);
  const dy = Math.round(m.dy);
  if (Math.abs(m.dx - dx) > 0.02 || Math.abs(m.dy - dy) > 0.02 || Math.abs(m.angle) * extent > 0.02) return null;
  return { dx, dy };
}

export function warpPlane(plane: Plane, motion: Motion): Plane {
  const { width: w, height: h } = plane;
  const out = new Float32Array(w * h);
  const whole = wholeShift(motion, Math.hypot(w, h));
  const m = whole ? { ...motion, dx: whole.dx, dy: whole.dy, angle: 0 } : motion;
  if (whole) {
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
  fillWarped(out, plane, { x: 0, y: 0, w, h }, m, 0, 0);
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
  const far = Math.max(Math.abs(rect.x - m.cx), Math.abs(rect.x + rect.w - m.cx)) + Math.max(Math.abs(rect.y - m.cy), Math.abs(rect.y + rect.h - m.cy));
  const whole = wholeShift(m, far);
  if (whole) return luminanceCrop(raster, rect, whole, scale).plane;
  const minDx = Math.floor(Math.min(...corners.map((o) => o.dx)));
  const maxDx = Math.ceil(Math.max(...corners.map((o) => o.dx)));
  const minDy = Math.floor(Math.min(...corners.map((o) => o.dy)));
  const maxDy = Math.ceil(Math.max(...corners.map((o) => o.dy)));
  // the source window, in on-photo coordinates read with a zero offset
  const src: Rect = { x: rect.x + minDx, y: rect.y + minDy, w: rect.w + maxDx - minDx + 1, h: rect.h + maxDy - minDy + 1 };
  const window = luminanceCrop(raster, src, { dx: 0, dy: 0 }, scale).plane;
  const out = new Float32Array(rect.w * rect.h);
  fillWarped(out, window, rect, m, src.x, src.y);
  return { data: out, width: rect.w, height: rect.h };
}

/**
 * out[j·w + i] = bilinear sample of `p` at the position, in p's own pixels (p's pixel (0, 0) sits at
 * (ox, oy) in reference coordinates), of reference pixel (rect.x + i, rect.y + j) under `m`. The
 * motion is affine, so the source position moves by a constant step along a row.
 */
function fillWarped(out: Float32Array, p: Plane, rect: Rect, m: Motion, ox: number, oy: number): void {
  const c = Math.cos(m.angle);
  const s = Math.sin(m.angle);
  const { width: pw, height: ph, data } = p;
  for (let j = 0; j < rect.h; j++) {
    const y = rect.y + j;
    const o = offsetAt(m, rect.x, y);
    // source position of the row's first pixel, and its step per pixel along the row
    let sx = rect.x + o.dx - ox;
    let sy = y + o.dy - oy;
    const stepX = m.angle === 0 ? 1 : c;
    const stepY = m.angle === 0 ? 0 : s;
    let k = j * rect.w;
    for (let i = 0; i < rect.w; i++, k++, sx += stepX, sy += stepY) {
      const x0 = Math.floor(sx);
      const y0 = Math.floor(sy);
      const fx = sx - x0;
      const fy = sy - y0;
      const x1 = fx > 0 ? x0 + 1 : x0;
      const y1 = fy > 0 ? y0 + 1 : y0;
      if (x0 < 0 || y0 < 0 || x1 >= pw || y1 >= ph) {
        out[k] = Number.NaN;
        continue;
      }
      const r0 = y0 * pw;
      const r1 = y1 * pw;
      const a = data[r0 + x0] as number;
      const b = data[r0 + x1] as number;
      const cc = data[r1 + x0] as number;
      const d = data[r1 + x1] as number;
      out[k] = (1 - fy) * (a + fx * (b - a)) + fy * (cc + fx * (d - cc));
    }
  }
}
