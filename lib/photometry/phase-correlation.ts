import { fft2d, multiplyConj, nextPow2 } from './fft2d';
import type { Offset, Plane } from './types';

function windowed(p: Plane, pw: number, ph: number): Float64Array {
  const { width: w, height: h, data } = p;
  let sum = 0;
  for (let i = 0; i < data.length; i++) sum += data[i] as number;
  const mean = sum / data.length;
  const out = new Float64Array(2 * pw * ph);
  for (let y = 0; y < h; y++) {
    // Hann window: the image borders would otherwise correlate as a strong edge at zero shift
    const wy = h > 1 ? 0.5 - 0.5 * Math.cos((2 * Math.PI * (y + 0.5)) / h) : 1;
    for (let x = 0; x < w; x++) {
      const wx = w > 1 ? 0.5 - 0.5 * Math.cos((2 * Math.PI * (x + 0.5)) / w) : 1;
      out[2 * (y * pw + x)] = ((data[y * w + x] as number) - mean) * wx * wy;
    }
  }
  return out;
}

/**
 * Integer translation of `moving` relative to `reference` (a feature at p in reference sits at
 * p + offset in moving) by phase correlation, searching |dx|, |dy| ≤ maxShift.
 * `peak` is the normalised correlation peak height (1 = identical up to translation).
 */
export function phaseCorrelate(reference: Plane, moving: Plane, maxShift: number): Offset & { peak: number } {
  if (reference.width !== moving.width || reference.height !== moving.height) throw new RangeError('planes must have the same size');
  if (!Number.isInteger(maxShift) || maxShift < 0) throw new RangeError('maxShift must be a non-negative integer');
  const { width: w, height: h } = reference;
  // zero padding to at least w + maxShift keeps wrapped-around shifts apart from real ones
  const pw = nextPow2(w + Math.min(maxShift, w));
  const ph = nextPow2(h + Math.min(maxShift, h));
  const a = windowed(reference, pw, ph);
  const b = windowed(moving, pw, ph);
  fft2d(a, pw, ph);
  fft2d(b, pw, ph);
  multiplyConj(b, a);
  let maxMag = 0;
  for (let i = 0; i < b.length; i += 2) maxMag = Math.max(maxMag, Math.hypot(b[i] as number, b[i + 1] as number));
  const eps = maxMag * 1e-9 + 1e-300;
  for (let i = 0; i < b.length; i += 2) {
    // Kuglin & Hines phase correlation: normalise the cross-power spectrum to unit magnitude
    const m = Math.hypot(b[i] as number, b[i + 1] as number) + eps;
    b[i] = (b[i] as number) / m;
    b[i + 1] = (b[i + 1] as number) / m;
  }
  fft2d(b, pw, ph, true);
  let best = -Infinity;
  let bx = 0;
  let by = 0;
  const rx = Math.min(maxShift, pw / 2 - 1);
  const ry = Math.min(maxShift, ph / 2 - 1);
  for (let dy = -ry; dy <= ry; dy++) {
    const iy = (dy + ph) % ph;
    for (let dx = -rx; dx <= rx; dx++) {
      const ix = (dx + pw) % pw;
      const v = b[2 * (iy * pw + ix)] as number;
      if (v > best) {
        best = v;
        bx = dx;
        by = dy;
      }
    }
  }
  return { dx: bx, dy: by, peak: best };
}
