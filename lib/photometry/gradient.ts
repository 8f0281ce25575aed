import { strided } from './detect-screen';
import { percentile } from './percentile';
import type { Plane } from './types';

/**
 * Gradient magnitude of log luminance. The log turns exposure and transmission differences into
 * offsets the gradient removes; the floor at 1% of the bright level keeps sensor noise in dark
 * areas from dominating.
 */
export function logGradient(plane: Plane): Plane {
  const { width: w, height: h, data } = plane;
  if (data.length !== w * h || w < 1 || h < 1) throw new RangeError('plane data does not match its size');
  // 20 000 samples put the 99th percentile within a fraction of a percent, plenty for a floor
  const p99 = percentile(strided(data, 20_000), 99);
  const floor = Number.isFinite(p99) && p99 > 0 ? 0.01 * p99 : 1e-6;
  const logs = new Float32Array(w * h);
  for (let i = 0; i < logs.length; i++) {
    const v = data[i] as number;
    // NaN (no data) becomes the floor, which has no gradient against itself
    logs[i] = Math.log((v === v ? Math.max(0, v) : 0) + floor);
  }
  const out = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    const ym = y > 0 ? y - 1 : y;
    const yp = y < h - 1 ? y + 1 : y;
    for (let x = 0; x < w; x++) {
      const xm = x > 0 ? x - 1 : x;
      const xp = x < w - 1 ? x + 1 : x;
      const gx = (logs[y * w + xp] as number) - (logs[y * w + xm] as number);
      const gy = (logs[yp * w + x] as number) - (logs[ym * w + x] as number);
      out[y * w + x] = Math.sqrt(gx * gx + gy * gy);
    }
  }
  return { data: out, width: w, height: h };
}
