import type { Plane } from './types';

/** out(x, y) = plane(x + dx, y + dy), NaN where that falls outside: brings a shifted photo onto the reference grid. */
export function shiftPlane(plane: Plane, dx: number, dy: number): Plane {
  if (!Number.isInteger(dx) || !Number.isInteger(dy)) throw new RangeError('shift must be integer');
  const { width: w, height: h, data } = plane;
  const out = new Float32Array(w * h).fill(Number.NaN);
  for (let y = 0; y < h; y++) {
    const sy = y + dy;
    if (sy < 0 || sy >= h) continue;
    const x0 = Math.max(0, -dx);
    const x1 = Math.min(w, w - dx);
    if (x1 > x0) out.set(data.subarray(sy * w + x0 + dx, sy * w + x1 + dx), y * w + x0);
  }
  return { data: out, width: w, height: h };
}

/** Element-wise a − b (NaN propagates). */
export function subtractPlanes(a: Plane, b: Plane): Plane {
  if (a.width !== b.width || a.height !== b.height) throw new RangeError('planes must have the same size');
  const ad = a.data;
  const bd = b.data;
  const out = new Float32Array(ad.length);
  for (let i = 0, n = out.length; i < n; i++) out[i] = (ad[i] as number) - (bd[i] as number);
  return { data: out, width: a.width, height: a.height };
}

/** The plane multiplied by a constant. */
export function scalePlane(p: Plane, k: number): Plane {
  if (k === 1) return p;
  const pd = p.data;
  const out = new Float32Array(pd.length);
  for (let i = 0, n = out.length; i < n; i++) out[i] = (pd[i] as number) * k;
  return { data: out, width: p.width, height: p.height };
}
