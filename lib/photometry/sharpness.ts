import FFT from 'fft.js';
import { percentile } from './percentile';
import type { Plane } from './types';

/**
 * Slanted-edge MTF (docs/method.md §5.10): edge spread → line spread → MTF of one edge region, the
 * method of ISO 12233 (docs/references.md). The edge is located row by row, a straight line fitted to
 * it, every pixel projected onto the edge's normal into bins a quarter of a pixel wide (the slant
 * puts each row's pixels at a different phase, so the bins fill), and the binned edge spread
 * differentiated, windowed and Fourier transformed.
 */

/** Bins per pixel across the edge. */
export const OVERSAMPLE = 4;
/** Length of the zero-padded transform: fine frequency steps (1/1024 cycle per pixel) for MTF50. */
const FFT_SIZE = 4096;
/** Highest frequency reported, cycles per pixel (twice the camera's Nyquist frequency). */
export const MTF_MAX_FREQUENCY = 1;
/** Step of the reported curve, cycles per pixel. */
export const MTF_CURVE_STEP = 0.01;
/** Widest half-window across the edge, pixels (keeps the bins within FFT_SIZE / 4). */
export const MAX_HALF_WIDTH = 128;
/** Narrowest half-window across the edge that still holds both plateaus, pixels. */
export const MIN_HALF_WIDTH = 6;

export interface EdgeMtf {
  /** Frequency where the MTF first falls to 0.5, cycles per pixel across the edge. */
  mtf50: number;
  /** The edge's angle from the pixel columns, degrees (signed; x grows with y for positive). */
  angleDeg: number;
  /** MTF on a fine grid of FFT_SIZE / OVERSAMPLE steps per cycle per pixel, from f = 0 to MTF_MAX_FREQUENCY. */
  fine: Float64Array;
  /** Rows whose edge position entered the line fit. */
  rows: number;
  /** Half-window across the edge used for the edge spread, pixels. */
  halfWidth: number;
}

export type EdgeMtfOutcome = { ok: true; edge: EdgeMtf } | { ok: false; reason: string };

let fftCache: FFT | null = null;
function fft(): FFT {
  fftCache ??= new FFT(FFT_SIZE);
  return fftCache;
}

/** Frequency of fine-grid index k, cycles per pixel. */
export function fineFrequency(k: number): number {
  return (k * OVERSAMPLE) / FFT_SIZE;
}

/** Number of fine-grid points from 0 to MTF_MAX_FREQUENCY inclusive. */
export const FINE_POINTS = Math.floor((MTF_MAX_FREQUENCY * FFT_SIZE) / OVERSAMPLE) + 1;

/** Least-squares line x = a + b·y through weighted points. */
function fitLine(ys: Float64Array, xs: Float64Array, n: number): { a: number; b: number } | null {
  let sy = 0;
  let sx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    const y = ys[i] as number;
    const x = xs[i] as number;
    sy += y;
    sx += x;
    syy += y * y;
    sxy += x * y;
  }
  const d = n * syy - sy * sy;
  if (n < 2 || !(Math.abs(d) > 0)) return null;
  const b = (n * sxy - sy * sx) / d;
  return { a: (sx - b * sy) / n, b };
}

/** Fits a line to per-row positions, drops rows far from it (beyond 4 robust sigmas, at least 0.5 px) and fits again. */
function robustLine(ys: Float64Array, xs: Float64Array, n: number): { a: number; b: number; kept: number } | null {
  const first = fitLine(ys, xs, n);
  if (!first) return null;
  const res = new Float64Array(n);
  for (let i = 0; i < n; i++) res[i] = Math.abs((xs[i] as number) - first.a - first.b * (ys[i] as number));
  // 1.4826·MAD: the normal distribution's sigma from the median absolute deviation (common practice)
  const limit = Math.max(0.5, 4 * 1.4826 * percentile(res, 50));
  const ky = new Float64Array(n);
  const kx = new Float64Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    if ((res[i] as number) <= limit) {
      ky[m] = ys[i] as number;
      kx[m] = xs[i] as number;
      m++;
    }
  }
  const second = fitLine(ky, kx, m);
  return second ? { ...second, kept: m } : null;
}

/**
 * MTF of one near-vertical edge (within ±30° of the pixel columns) in `plane`, dark on either side.
 * `halfWidth` caps the distance from the edge used for the edge spread (default: as much as every
 * row holds, up to MAX_HALF_WIDTH). NaN pixels are skipped. Throws RangeError on a malformed plane.
 */
export function slantedEdgeMtf(plane: Plane, opts: { halfWidth?: number } = {}): EdgeMtfOutcome {
  const { data, width: W, height: H } = plane;
  if (!Number.isInteger(W) || !Number.isInteger(H) || W < 1 || H < 1 || data.length !== W * H) throw new RangeError('the plane size does not match its data');
  if (opts.halfWidth !== undefined && !(opts.halfWidth >= MIN_HALF_WIDTH)) throw new RangeError(`halfWidth must be at least ${MIN_HALF_WIDTH} px`);
  if (W < 2 * MIN_HALF_WIDTH + 2 || H < 16) return { ok: false, reason: `the edge region ${W} × ${H} px is too small (at least ${2 * MIN_HALF_WIDTH + 2} × 16)` };

  // plateau levels: the means of the outer eighths of the region, over every row
  const k = Math.max(2, Math.floor(W / 8));
  let left = 0;
  let right = 0;
  let nl = 0;
  let nr = 0;
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < k; x++) {
      const a = data[y * W + x] as number;
      const b = data[y * W + W - 1 - x] as number;
      if (a === a) { left += a; nl++; }
      if (b === b) { right += b; nr++; }
    }
  }
  if (nl === 0 || nr === 0) return { ok: false, reason: 'the edge region holds no data' };
  left /= nl;
  right /= nr;
  const step = right - left;
  if (!(Math.abs(step) > 0)) return { ok: false, reason: 'no edge: both sides of the region are equally bright' };

  // pass 1: each row's edge by the area under its normalised profile (an ideal step from the left
  // level to the right one at x_e leaves W − x_e of it), robust to noise as it sums the whole row
  const ys = new Float64Array(H);
  const xs = new Float64Array(H);
  let n = 0;
  for (let y = 0; y < H; y++) {
    let s = 0;
    let c = 0;
    for (let x = 0; x < W; x++) {
      const v = data[y * W + x] as number;
      if (v !== v) break;
      s += (v - left) / step;
      c++;
    }
    if (c !== W) continue;
    const xe = W - s - 0.5;
    if (xe > 1 && xe < W - 2) {
      ys[n] = y;
      xs[n] = xe;
      n++;
    }
  }
  if (n < 16) return { ok: false, reason: 'no clear edge across the region' };
  let line = robustLine(ys, xs, n);
  if (!line) return { ok: false, reason: 'no clear edge across the region' };

  // pass 2: the centroid of each row's derivative under a Hamming window centred on the first line
  // (docs/method.md §5.10), then the line again
  const hw = Math.max(4, Math.min(Math.floor(W / 4), 24));
  n = 0;
  for (let y = 0; y < H; y++) {
    const xc = line.a + line.b * y;
    const x0 = Math.max(1, Math.floor(xc - hw));
    const x1 = Math.min(W - 2, Math.ceil(xc + hw));
    let sw = 0;
    let sxw = 0;
    let bad = false;
    for (let x = x0; x <= x1; x++) {
      const a = data[y * W + x - 1] as number;
      const b = data[y * W + x + 1] as number;
      if (a !== a || b !== b) { bad = true; break; }
      const d = ((b - a) / 2) * Math.sign(step);
      // Hamming window: 0.54 + 0.46·cos(π·u), u the distance from the centre over the half-width
      const u = (x - xc) / hw;
      const w = Math.abs(u) <= 1 ? 0.54 + 0.46 * Math.cos(Math.PI * u) : 0;
      sw += d * w;
      sxw += x * d * w;
    }
    if (bad || !(sw > 0.5 * Math.abs(step) * 0.25)) continue;
    ys[n] = y;
    xs[n] = sxw / sw;
    n++;
  }
  if (n < 16) return { ok: false, reason: 'no clear edge across the region' };
  line = robustLine(ys, xs, n);
  if (!line) return { ok: false, reason: 'no clear edge across the region' };
  const rows = line.kept;
  const { a, b } = line;
  const angle = Math.atan(b);
  if (Math.abs(angle) > (30 * Math.PI) / 180) return { ok: false, reason: `the edge is turned ${((angle * 180) / Math.PI).toFixed(1)}° from the pixel columns: at most 30°` };
  // the rows' phases must spread over a pixel at least twice, or the quarter-pixel bins stay empty
  if (Math.abs(b) * H < 2) return { ok: false, reason: `the edge is turned only ${((angle * 180) / Math.PI).toFixed(2)}° from the pixel columns: it must slant (about 5°) so its rows fall at different phases` };

  // the half-window: what every row holds on both sides of the edge, within the caps
  const cos = Math.cos(angle);
  let room = Number.POSITIVE_INFINITY;
  for (const y of [0, H - 1]) {
    const xe = a + b * y;
    room = Math.min(room, xe, W - 1 - xe);
  }
  let R = Math.floor(room * cos) - 1;
  R = Math.min(R, MAX_HALF_WIDTH, opts.halfWidth ?? MAX_HALF_WIDTH);
  if (R < MIN_HALF_WIDTH) return { ok: false, reason: `the edge sits too close to the region's side: ${MIN_HALF_WIDTH} px are needed on each side` };

  // edge spread: every pixel at its distance along the edge's normal, in bins of 1/OVERSAMPLE px
  const bins = 2 * R * OVERSAMPLE;
  const sum = new Float64Array(bins);
  const count = new Float64Array(bins);
  for (let y = 0; y < H; y++) {
    const xe = a + b * y;
    const x0 = Math.max(0, Math.floor(xe - R / cos) - 1);
    const x1 = Math.min(W - 1, Math.ceil(xe + R / cos) + 1);
    for (let x = x0; x <= x1; x++) {
      const v = data[y * W + x] as number;
      if (v !== v) continue;
      const i = Math.floor(((x - xe) * cos + R) * OVERSAMPLE);
      if (i < 0 || i >= bins) continue;
      sum[i] = (sum[i] as number) + v;
      count[i] = (count[i] as number) + 1;
    }
  }
  const esf = new Float64Array(bins);
  let empty = 0;
  for (let i = 0; i < bins; i++) {
    if ((count[i] as number) > 0) esf[i] = (sum[i] as number) / (count[i] as number);
    else {
      esf[i] = Number.NaN;
      empty++;
    }
  }
  if (empty > bins / 10) return { ok: false, reason: 'too few rows across the edge to fill the quarter-pixel bins' };
  fillGaps(esf);

  // line spread: the central difference of the edge spread, signed so it is positive
  const lsf = new Float64Array(bins);
  for (let i = 1; i < bins - 1; i++) lsf[i] = (((esf[i + 1] as number) - (esf[i - 1] as number)) / 2) * Math.sign(step);
  lsf[0] = lsf[1] as number;
  lsf[bins - 1] = lsf[bins - 2] as number;

  // a Tukey window (flat over the middle half, cosine tapers outside) centred on the line spread's
  // centroid quiets the plateaus' noise without narrowing a wide line spread (docs/method.md §5.10)
  // its half-width: six 10–90% rises of the edge spread (the flat part then holds the line spread
  // to three rises each side, about ±8σ of a Gaussian), at least 4 px, at most what the bins hold
  const centre = lsfCentre(lsf);
  const rise = riseOf(esf, Math.sign(step));
  const half = Math.min(centre, bins - 1 - centre, Math.max(4 * OVERSAMPLE, Math.ceil(6 * rise)));
  if (half < 2 * OVERSAMPLE) return { ok: false, reason: 'the line spread is not centred in the region' };
  const input = new Float64Array(2 * FFT_SIZE);
  let total = 0;
  for (let i = 0; i < bins; i++) {
    const u = Math.abs(i - centre) / half;
    const w = u <= 0.5 ? 1 : u <= 1 ? 0.5 * (1 + Math.cos(2 * Math.PI * (u - 0.5))) : 0;
    const v = (lsf[i] as number) * w;
    input[2 * i] = v;
    total += v;
  }
  if (!(total > 0)) return { ok: false, reason: 'no clear edge across the region' };
  const out = new Float64Array(2 * FFT_SIZE);
  fft().transform(out, input);
  const dc = Math.hypot(out[0] as number, out[1] as number);
  const fine = new Float64Array(FINE_POINTS);
  const dx = 1 / OVERSAMPLE;
  for (let kk = 0; kk < FINE_POINTS; kk++) {
    const f = fineFrequency(kk);
    const m = Math.hypot(out[2 * kk] as number, out[2 * kk + 1] as number) / dc;
    // the central difference passes sin(2πfΔ)/(2πfΔ) of a true derivative, and the bins average over
    // Δ = 1/OVERSAMPLE px, passing sinc(fΔ): both divided out (docs/method.md §5.10)
    const derivative = kk === 0 ? 1 : Math.sin(2 * Math.PI * f * dx) / (2 * Math.PI * f * dx);
    const bin = kk === 0 ? 1 : Math.sin(Math.PI * f * dx) / (Math.PI * f * dx);
    fine[kk] = m / (derivative * bin);
  }
  const m50 = mtf50Of(fine);
  if (m50 === null) return { ok: false, reason: 'the MTF stays above 0.5 up to 1 cycle per pixel: the edge is sharper than the camera resolves, or the photo was sharpened' };
  return { ok: true, edge: { mtf50: m50, angleDeg: (angle * 180) / Math.PI, fine, rows, halfWidth: R } };
}

/** Linear interpolation over NaN runs (ends take the nearest value). */
function fillGaps(v: Float64Array): void {
  const n = v.length;
  let last = -1;
  for (let i = 0; i < n; i++) {
    if (Number.isNaN(v[i] as number)) continue;
    if (last < i - 1) {
      for (let j = last + 1; j < i; j++) v[j] = last < 0 ? (v[i] as number) : (v[last] as number) + (((v[i] as number) - (v[last] as number)) * (j - last)) / (i - last);
    }
    last = i;
  }
  for (let j = last + 1; j < n; j++) v[j] = v[last] as number;
}

/** The 10–90% rise of an edge spread, in bins (its plateaus: the means of its outer tenths). */
function riseOf(esf: Float64Array, sign: number): number {
  const n = esf.length;
  const k = Math.max(1, Math.floor(n / 10));
  let lo = 0;
  let hi = 0;
  for (let i = 0; i < k; i++) {
    lo += (esf[i] as number) * sign;
    hi += (esf[n - 1 - i] as number) * sign;
  }
  lo /= k;
  hi /= k;
  const at = (share: number): number => {
    const level = lo + share * (hi - lo);
    // the last crossing from below, so noise on the low plateau does not start the rise early
    for (let i = n - 1; i > 0; i--) {
      const a = (esf[i - 1] as number) * sign;
      const b = (esf[i] as number) * sign;
      if (a < level && b >= level) return i - 1 + (level - a) / (b - a);
    }
    return 0;
  };
  return Math.max(0, at(0.9) - at(0.1));
}

/** Centroid of the line spread's positive part within the central half-width around its peak. */
function lsfCentre(lsf: Float64Array): number {
  let peak = 0;
  for (let i = 1; i < lsf.length; i++) if ((lsf[i] as number) > (lsf[peak] as number)) peak = i;
  const reach = Math.max(OVERSAMPLE, Math.floor(lsf.length / 4));
  let s = 0;
  let sx = 0;
  for (let i = Math.max(0, peak - reach); i <= Math.min(lsf.length - 1, peak + reach); i++) {
    const v = Math.max(0, lsf[i] as number);
    s += v;
    sx += i * v;
  }
  return s > 0 ? Math.round(sx / s) : peak;
}

/** The first frequency where a fine-grid MTF falls to 0.5 (linear between grid points), or null. */
export function mtf50Of(fine: ArrayLike<number>): number | null {
  for (let k = 1; k < fine.length; k++) {
    const m = fine[k] as number;
    if (m <= 0.5) {
      const p = fine[k - 1] as number;
      const t = p === m ? 0 : (p - 0.5) / (p - m);
      return fineFrequency(k - 1 + t);
    }
  }
  return null;
}

/** A fine-grid MTF sampled every MTF_CURVE_STEP cycles per pixel, rounded to 4 decimals. */
export function curveOf(fine: ArrayLike<number>): { f: number; mtf: number }[] {
  const out: { f: number; mtf: number }[] = [];
  const steps = Math.round(MTF_MAX_FREQUENCY / MTF_CURVE_STEP);
  for (let i = 0; i <= steps; i++) {
    const f = i * MTF_CURVE_STEP;
    const pos = (f * FFT_SIZE) / OVERSAMPLE;
    const k = Math.min(fine.length - 2, Math.floor(pos));
    const t = pos - k;
    const m = (fine[k] as number) * (1 - t) + (fine[k + 1] as number) * t;
    out.push({ f: Math.round(f * 1000) / 1000, mtf: Math.round(m * 1e4) / 1e4 });
  }
  return out;
}

/** The plane turned a quarter (x ↔ y), so a near-horizontal edge becomes a near-vertical one. */
export function transposePlane(p: Plane): Plane {
  const { width: W, height: H, data } = p;
  const out = new Float32Array(W * H);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) out[x * H + y] = data[y * W + x] as number;
  return { data: out, width: H, height: W };
}

/** The mean of several edges' fine-grid MTFs and its MTF50 (null when it never falls to 0.5). */
export function meanMtf(edges: readonly EdgeMtf[]): { fine: Float64Array; mtf50: number | null } {
  if (edges.length === 0) throw new RangeError('meanMtf needs at least one edge');
  const fine = new Float64Array(FINE_POINTS);
  for (const e of edges) for (let k = 0; k < FINE_POINTS; k++) fine[k] = (fine[k] as number) + (e.fine[k] as number) / edges.length;
  return { fine, mtf50: mtf50Of(fine) };
}
