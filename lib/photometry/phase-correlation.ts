import { fft2d, inverseFft2dRows, nextPow2, packPair, pairCrossPower, shiftRows } from './fft2d';
import type { Offset, Plane } from './types';

/** Hann window weights for n samples: the borders would otherwise correlate as a strong edge at zero shift. */
function hann(n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = n > 1 ? 0.5 - 0.5 * Math.cos((2 * Math.PI * (i + 0.5)) / n) : 1;
  return out;
}

function mean(data: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < data.length; i++) sum += data[i] as number;
  return sum / data.length;
}

/** A plane with its mean removed, under a Hann window; pixels the mask leaves out (0) are zero after the mean's removal. */
function windowed(p: Plane, mask?: Uint8Array | null): Float64Array {
  const { width: w, height: h, data } = p;
  let m = 0;
  if (mask) {
    let n = 0;
    for (let i = 0; i < data.length; i++) if (mask[i]) { m += data[i] as number; n++; }
    m = n > 0 ? m / n : 0;
  } else m = mean(data);
  const wx = hann(w);
  const wy = hann(h);
  const out = new Float64Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) out[y * w + x] = mask && !mask[y * w + x] ? 0 : ((data[y * w + x] as number) - m) * ((wx[x] as number) * (wy[y] as number));
  }
  return out;
}

/**
 * Integer translation of `moving` relative to `reference` (a feature at p in reference sits at
 * p + offset in moving) by phase correlation, searching |dx|, |dy| ≤ maxShift.
 * `peak` is the normalised correlation peak height (1 = identical up to translation); `runnerUp` is
 * the highest value more than 2 px from it (a peak that barely beats it is not a reliable match).
 * `mask` (1 = use) leaves pixels out of both planes, e.g. the display's own light, which differs
 * between the photos by design.
 */
export function phaseCorrelate(reference: Plane, moving: Plane, maxShift: number, mask?: Uint8Array | null): Offset & { peak: number; runnerUp: number } {
  if (reference.width !== moving.width || reference.height !== moving.height) throw new RangeError('planes must have the same size');
  if (!Number.isInteger(maxShift) || maxShift < 0) throw new RangeError('maxShift must be a non-negative integer');
  const { width: w, height: h } = reference;
  // zero padding to at least w + maxShift keeps wrapped-around shifts apart from real ones
  const pw = nextPow2(w + Math.min(maxShift, w));
  const ph = nextPow2(h + Math.min(maxShift, h));
  // reference as the real part, moving as the imaginary part: one transform serves both
  const z = packPair(windowed(reference, mask), windowed(moving, mask), w, h, pw, ph);
  fft2d(z, pw, ph, false, h);
  // the cross-power spectrum M·conj(R) of reference R and moving M
  const cross = pairCrossPower(z, pw, ph);
  let maxMag = 0;
  for (let i = 0; i < cross.length; i += 2) {
    const re = cross[i] as number;
    const im = cross[i + 1] as number;
    const mag = Math.sqrt(re * re + im * im);
    if (mag > maxMag) maxMag = mag;
  }
  const eps = maxMag * 1e-9 + 1e-300;
  for (let i = 0; i < cross.length; i += 2) {
    // Kuglin & Hines phase correlation: normalise the cross-power spectrum to unit magnitude
    const re = cross[i] as number;
    const im = cross[i + 1] as number;
    const m = Math.sqrt(re * re + im * im) + eps;
    cross[i] = re / m;
    cross[i + 1] = im / m;
  }
  const rx = Math.min(maxShift, pw / 2 - 1);
  const ry = Math.min(maxShift, ph / 2 - 1);
  // only the rows of the shifts searched are transformed back
  inverseFft2dRows(cross, pw, ph, shiftRows(ph, ry));
  let best = -Infinity;
  let bx = 0;
  let by = 0;
  for (let dy = -ry; dy <= ry; dy++) {
    const iy = (dy + ph) % ph;
    for (let dx = -rx; dx <= rx; dx++) {
      const ix = (dx + pw) % pw;
      const v = cross[2 * (iy * pw + ix)] as number;
      if (v > best) {
        best = v;
        bx = dx;
        by = dy;
      }
    }
  }
  let second = -Infinity;
  for (let dy = -ry; dy <= ry; dy++) {
    const iy = (dy + ph) % ph;
    for (let dx = -rx; dx <= rx; dx++) {
      if (Math.abs(dx - bx) <= 2 && Math.abs(dy - by) <= 2) continue;
      const v = cross[2 * (iy * pw + (dx + pw) % pw)] as number;
      if (v > second) second = v;
    }
  }
  return { dx: bx, dy: by, peak: best, runnerUp: Number.isFinite(second) ? second : 0 };
}
