import { luminanceCrop } from './crop';
import { boxDownsample } from './downsample';
import { logGradient } from './gradient';
import { phaseCorrelate } from './phase-correlation';
import { strided } from './detect-screen';
import { percentile } from './percentile';
import type { Offset, Plane, PhotoRaster, Rect } from './types';

export interface RegistrationInput {
  reference: PhotoRaster;
  moving: PhotoRaster;
  /** Downsampled luminance of both photos, made with `factor`. */
  referenceSmall: Plane;
  movingSmall: Plane;
  factor: number;
  /** Largest shift to look for, in full-resolution pixels. */
  maxShift: number;
}

// small enough that the frame plus a 10% search reach fits a 256-point transform
const COARSE_SIZE = 200;
const FINE_SIZE = 256;

// a fine peak this low means the window held no shared structure: keep the coarse answer
const MIN_FINE_PEAK = 0.05;

function trustFine(d0: Offset, fine: Offset & { peak: number }, coarsePeak: number): Offset & { peak: number } {
  return fine.peak >= MIN_FINE_PEAK ? { dx: d0.dx + fine.dx, dy: d0.dy + fine.dy, peak: fine.peak } : { ...d0, peak: coarsePeak };
}

function fillNaN(p: Plane): Plane {
  const src = p.data;
  let sum = 0;
  let n = 0;
  for (let i = 0; i < src.length; i++) {
    const v = src[i] as number;
    if (v === v) { sum += v; n++; }
  }
  const mean = n > 0 ? sum / n : 0;
  const data = new Float32Array(src.length);
  for (let i = 0; i < src.length; i++) {
    const v = src[i] as number;
    data[i] = v === v ? v : mean;
  }
  return { data, width: p.width, height: p.height };
}

function logPlane(p: Plane): Float32Array {
  const p99 = percentile(strided(p.data, 50_000), 99);
  // a higher floor than the correlation's own, so noise in dark areas never looks like corners
  const floor = p99 > 0 ? 0.05 * p99 : 1e-6;
  const src = p.data;
  const out = new Float32Array(src.length);
  for (let i = 0; i < src.length; i++) {
    const v = src[i] as number;
    out[i] = Math.log((v === v ? Math.max(0, v) : 0) + floor);
  }
  return out;
}

/** Summed-area tables of gx², gy² and gx·gy, (w + 1) × (h + 1) each. */
function tensorTables(gx: Float32Array, gy: Float32Array, w: number, h: number): [Float64Array, Float64Array, Float64Array] {
  const xx = new Float64Array((w + 1) * (h + 1));
  const yy = new Float64Array((w + 1) * (h + 1));
  const xy = new Float64Array((w + 1) * (h + 1));
  for (let y = 0; y < h; y++) {
    let rxx = 0;
    let ryy = 0;
    let rxy = 0;
    for (let x = 0; x < w; x++) {
      const a = gx[y * w + x] as number;
      const b = gy[y * w + x] as number;
      rxx += a * a;
      ryy += b * b;
      rxy += a * b;
      const o = (y + 1) * (w + 1) + x + 1;
      const u = y * (w + 1) + x + 1;
      xx[o] = (xx[u] as number) + rxx;
      yy[o] = (yy[u] as number) + ryy;
      xy[o] = (xy[u] as number) + rxy;
    }
  }
  return [xx, yy, xy];
}

// Window for the full-resolution step, in coarse pixels: the one whose weaker photo has the
// largest smaller eigenvalue of the gradient structure tensor, i.e. corners in both photos.
// A window holding one straight edge would leave the shift along that edge undetermined.
function texturedWindow(a: Plane, b: Plane, shift: Offset, size: number): { x: number; y: number } {
  const { width: w, height: h } = a;
  const s = Math.min(size, w, h);
  const ta = structureTables(a, 0, 0);
  // the moving photo is read where the reference pixel's feature lies
  const tb = structureTables(b, shift.dx, shift.dy);
  let best = -1;
  let bx = 0;
  let by = 0;
  const step = Math.max(1, Math.floor(s / 8));
  for (let y = 0; y + s <= h; y += step) {
    for (let x = 0; x + s <= w; x += step) {
      const score = Math.min(minEigen(ta, w, x, y, s), minEigen(tb, w, x, y, s));
      if (score > best) { best = score; bx = x; by = y; }
    }
  }
  return { x: bx, y: by };
}

/** Summed-area tables of the gradient structure tensor of log luminance, the plane read `sx, sy` pixels away. */
function structureTables(p: Plane, sx: number, sy: number): [Float64Array, Float64Array, Float64Array] {
  const { width: w, height: h } = p;
  const l = logPlane(p);
  const gx = new Float32Array(w * h);
  const gy = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    const v = Math.min(h - 2, Math.max(1, y + sy));
    for (let x = 0; x < w; x++) {
      const u = Math.min(w - 2, Math.max(1, x + sx));
      gx[y * w + x] = ((l[v * w + u + 1] as number) - (l[v * w + u - 1] as number)) / 2;
      gy[y * w + x] = ((l[(v + 1) * w + u] as number) - (l[(v - 1) * w + u] as number)) / 2;
    }
  }
  return tensorTables(gx, gy, w, h);
}

function boxSum(sat: Float64Array, w: number, x: number, y: number, s: number): number {
  return (sat[(y + s) * (w + 1) + x + s] as number) - (sat[y * (w + 1) + x + s] as number) - (sat[(y + s) * (w + 1) + x] as number) + (sat[y * (w + 1) + x] as number);
}

/** Smaller eigenvalue of the structure tensor summed over the s × s window at (x, y). */
function minEigen(t: [Float64Array, Float64Array, Float64Array], w: number, x: number, y: number, s: number): number {
  const p = boxSum(t[0], w, x, y, s);
  const q = boxSum(t[1], w, x, y, s);
  const r = boxSum(t[2], w, x, y, s);
  return (p + q) / 2 - Math.sqrt(((p - q) / 2) ** 2 + r * r);
}

/**
 * Integer translation of `moving` against `reference` (feature in moving minus feature in reference):
 * phase correlation of log-gradient images, first on the whole downsampled frame, then at full
 * resolution on the window where both photos share the most texture.
 */
export function registerPhotos(input: RegistrationInput): Offset & { peak: number } {
  const { reference, moving, referenceSmall, movingSmall, factor } = input;
  if (reference.width !== moving.width || reference.height !== moving.height) throw new RangeError('photos must have the same size');
  if (referenceSmall.width !== movingSmall.width || referenceSmall.height !== movingSmall.height) throw new RangeError('downsampled planes differ in size');
  const r = Math.max(1, Math.ceil(Math.max(referenceSmall.width, referenceSmall.height) / COARSE_SIZE));
  const scale = r * factor;
  const ra = boxDownsample(referenceSmall, r);
  const rb = boxDownsample(movingSmall, r);
  const ga = logGradient(ra);
  const gb = logGradient(rb);
  const coarseMax = Math.max(1, Math.ceil(input.maxShift / scale) + 1);
  const coarse = phaseCorrelate(ga, gb, Math.min(coarseMax, ga.width, ga.height));
  const d0: Offset = { dx: coarse.dx * scale, dy: coarse.dy * scale };
  if (scale === 1) return coarse;

  // the window plus the search reach fits one power-of-two transform
  const fineSize = Math.min(FINE_SIZE - (scale + 2), reference.width, reference.height);
  const win = texturedWindow(ra, rb, coarse, Math.max(1, Math.round(fineSize / scale)));
  const rect: Rect = {
    x: Math.min(reference.width - fineSize, win.x * scale),
    y: Math.min(reference.height - fineSize, win.y * scale),
    w: fineSize,
    h: fineSize,
  };
  const fa = logGradient(fillNaN(luminanceCrop(reference, rect, { dx: 0, dy: 0 }, 1).plane));
  const fb = logGradient(fillNaN(luminanceCrop(moving, rect, d0, 1).plane));
  const fine = phaseCorrelate(fa, fb, Math.min(scale + 2, fineSize - 1));
  return trustFine(d0, fine, coarse.peak);
}

function cropPlane(p: Plane, rect: Rect, offset: Offset): Plane {
  const out = new Float32Array(rect.w * rect.h).fill(Number.NaN);
  for (let j = 0; j < rect.h; j++) {
    const sy = rect.y + j + offset.dy;
    if (sy < 0 || sy >= p.height) continue;
    for (let i = 0; i < rect.w; i++) {
      const sx = rect.x + i + offset.dx;
      if (sx >= 0 && sx < p.width) out[j * rect.w + i] = p.data[sy * p.width + sx] as number;
    }
  }
  return { data: out, width: rect.w, height: rect.h };
}

/**
 * Registration of two planes of the same (downsampled) grid, e.g. a dark photo against the on − off
 * difference, which share the display's content rather than the room's. Same two steps as
 * registerPhotos, with the plane itself as the finest level; the result is in the plane's pixels.
 */
export function registerPlanes(reference: Plane, moving: Plane, maxShift: number): Offset & { peak: number } {
  if (reference.width !== moving.width || reference.height !== moving.height) throw new RangeError('planes must have the same size');
  const r = Math.max(1, Math.ceil(Math.max(reference.width, reference.height) / COARSE_SIZE));
  const ca = boxDownsample(reference, r);
  const cb = boxDownsample(moving, r);
  const coarse = phaseCorrelate(logGradient(ca), logGradient(cb), Math.min(Math.max(1, Math.ceil(maxShift / r) + 1), ca.width, ca.height));
  if (r === 1) return coarse;
  const d0: Offset = { dx: coarse.dx * r, dy: coarse.dy * r };
  const size = Math.min(FINE_SIZE - (r + 2), reference.width, reference.height);
  const win = texturedWindow(ca, cb, coarse, Math.max(1, Math.round(size / r)));
  const rect: Rect = { x: Math.min(reference.width - size, win.x * r), y: Math.min(reference.height - size, win.y * r), w: size, h: size };
  const fine = phaseCorrelate(logGradient(fillNaN(cropPlane(reference, rect, { dx: 0, dy: 0 }))), logGradient(fillNaN(cropPlane(moving, rect, d0))), Math.min(r + 2, size - 1));
  return trustFine(d0, fine, coarse.peak);
}
