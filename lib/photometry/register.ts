import { luminanceCrop } from './crop';
import { boxDownsample } from './downsample';
import { offsetAt, type Motion } from './motion';
import { warpedCrop } from './warp';
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
  /**
   * Rectangles (full-resolution pixels of the reference) left out of the correlation: the display's
   * own light (the screen grown by its edge spread, the ghost's band), which differs between the
   * photos by design and whose bright edges would otherwise win over the room's.
   */
  mask?: readonly Rect[] | null;
  /** Stop after the coarse correlation (a first look that only needs to find the display). */
  coarseOnly?: boolean;
}

/** A registration: the motion found and how far it can be trusted. */
export interface Registration extends Motion {
  /** Height of the coarse correlation peak, and of the highest value away from it. */
  peak: number;
  runnerUp: number;
  /** Windows whose full-resolution alignment went into the motion. */
  windows: number;
  /** RMS residual after alignment over the RMS signal of the window, the median over windows (0 = perfect). */
  residual: number;
  /** Largest distance between a window's own shift and the fitted motion there, px. */
  spread: number;
}

// small enough that the frame plus a 10% search reach fits a 256-point transform
const COARSE_SIZE = 200;
const FINE_SIZE = 256;
// Lucas–Kanade window: 128² pixels of texture put a shift to a few hundredths of a pixel
const LK_SIZE = 128;
// a window whose shift is less certain than this (px, one standard error) is left out
const MAX_SHIFT_SE = 0.05;

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

/** Summed-area tables of the gradient structure tensor of log luminance, the plane read `sx, sy` pixels away. */
function structureTables(p: Plane, sx: number, sy: number, mask: Uint8Array | null = null): [Float64Array, Float64Array, Float64Array] {
  const { width: w, height: h } = p;
  const l = logPlane(p);
  const gx = new Float32Array(w * h);
  const gy = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    const v = Math.min(h - 2, Math.max(1, y + sy));
    for (let x = 0; x < w; x++) {
      const u = Math.min(w - 2, Math.max(1, x + sx));
      // masked pixels (the display's light) count as no texture
      if (mask && !mask[y * w + x]) continue;
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
export function registerPlanes(reference: Plane, moving: Plane, maxShift: number): Offset & { peak: number; runnerUp: number } {
  if (reference.width !== moving.width || reference.height !== moving.height) throw new RangeError('planes must have the same size');
  const r = Math.max(1, Math.ceil(Math.max(reference.width, reference.height) / COARSE_SIZE));
  const ca = boxDownsample(reference, r);
  const cb = boxDownsample(moving, r);
  const coarse = phaseCorrelate(logGradient(ca), logGradient(cb), Math.min(Math.max(1, Math.ceil(maxShift / r) + 1), ca.width, ca.height));
  if (r === 1) return coarse;
  const d0: Offset = { dx: coarse.dx * r, dy: coarse.dy * r };
  const size = Math.min(FINE_SIZE - (r + 2), reference.width, reference.height);
  const win = bestWindows(ca, cb, coarse, Math.max(1, Math.round(size / r)), null, 1)[0] ?? { x: 0, y: 0 };
  const rect: Rect = { x: Math.min(reference.width - size, win.x * r), y: Math.min(reference.height - size, win.y * r), w: size, h: size };
  const fine = phaseCorrelate(logGradient(fillNaN(cropPlane(reference, rect, { dx: 0, dy: 0 }))), logGradient(fillNaN(cropPlane(moving, rect, d0))), Math.min(r + 2, size - 1));
  return { ...trustFine(d0, fine, coarse.peak), runnerUp: coarse.runnerUp };
}

/** Mask of a plane downsampled by `scale` from the full frame: 1 = use, 0 = a cell touching a masked rectangle. */
function maskGrid(rects: readonly Rect[] | null | undefined, w: number, h: number, scale: number): Uint8Array | null {
  if (!rects || rects.length === 0) return null;
  const m = new Uint8Array(w * h).fill(1);
  for (const r of rects) {
    const x0 = Math.max(0, Math.floor(r.x / scale));
    const y0 = Math.max(0, Math.floor(r.y / scale));
    const x1 = Math.min(w, Math.ceil((r.x + r.w) / scale));
    const y1 = Math.min(h, Math.ceil((r.y + r.h) / scale));
    for (let y = y0; y < y1; y++) m.fill(0, y * w + x0, y * w + Math.max(x0, x1));
  }
  return m;
}

/** Summed-area table of a 0/1 mask's zeros. */
function maskedTable(mask: Uint8Array | null, w: number, h: number): Float64Array | null {
  if (!mask) return null;
  const t = new Float64Array((w + 1) * (h + 1));
  for (let y = 0; y < h; y++) {
    let run = 0;
    for (let x = 0; x < w; x++) {
      run += mask[y * w + x] ? 0 : 1;
      t[(y + 1) * (w + 1) + x + 1] = (t[y * (w + 1) + x + 1] as number) + run;
    }
  }
  return t;
}

/**
 * Up to `count` windows of s × s coarse pixels where both photos share the most texture (the
 * largest smaller eigenvalue of the gradient structure tensor: corners, not one straight edge,
 * which would leave the shift along it open), one per part of the frame when count is 4 (the
 * quadrants, so a rotation shows as different shifts); masked pixels count as no texture, and a
 * window more than 70% masked is not used.
 */
function bestWindows(a: Plane, b: Plane, shift: Offset, size: number, mask: Uint8Array | null, count: number): { x: number; y: number }[] {
  const { width: w, height: h } = a;
  const s = Math.min(size, w, h);
  const ta = structureTables(a, 0, 0, mask);
  const tb = structureTables(b, shift.dx, shift.dy, mask);
  const tm = maskedTable(mask, w, h);
  const parts: Rect[] = count >= 4 ? [
    { x: 0, y: 0, w: Math.ceil(w / 2), h: Math.ceil(h / 2) },
    { x: Math.floor(w / 2), y: 0, w: Math.ceil(w / 2), h: Math.ceil(h / 2) },
    { x: 0, y: Math.floor(h / 2), w: Math.ceil(w / 2), h: Math.ceil(h / 2) },
    { x: Math.floor(w / 2), y: Math.floor(h / 2), w: Math.ceil(w / 2), h: Math.ceil(h / 2) },
  ] : [{ x: 0, y: 0, w, h }];
  const out: { x: number; y: number }[] = [];
  const step = Math.max(1, Math.floor(s / 8));
  for (const part of parts) {
    let best = 0;
    let found: { x: number; y: number } | null = null;
    // a window may reach past its part by half its size, so small frames still get four
    const xa = Math.max(0, Math.min(w - s, part.x - Math.floor(s / 2)));
    const xb = Math.max(0, Math.min(w - s, part.x + part.w - Math.ceil(s / 2)));
    const ya = Math.max(0, Math.min(h - s, part.y - Math.floor(s / 2)));
    const yb = Math.max(0, Math.min(h - s, part.y + part.h - Math.ceil(s / 2)));
    for (let y = ya; y <= yb; y += step) {
      for (let x = xa; x <= xb; x += step) {
        // the window's centre must lie in its part
        const cx = x + s / 2;
        const cy = y + s / 2;
        if (count >= 4 && (cx < part.x || cx > part.x + part.w || cy < part.y || cy > part.y + part.h)) continue;
        // mostly masked windows hold too little of the room to align on
        if (tm && boxSum(tm, w, x, y, s) > 0.7 * s * s) continue;
        const score = Math.min(minEigen(ta, w, x, y, s), minEigen(tb, w, x, y, s));
        if (score > best) { best = score; found = { x, y }; }
      }
    }
    if (found) out.push(found);
  }
  return out;
}

/** 1 where a window pixel lies outside every masked rectangle. */
function windowMask(rect: Rect, mask: readonly Rect[] | null | undefined): Uint8Array | null {
  if (!mask || mask.length === 0) return null;
  const m = new Uint8Array(rect.w * rect.h).fill(1);
  let any = false;
  for (const r of mask) {
    const x0 = Math.max(rect.x, r.x);
    const x1 = Math.min(rect.x + rect.w, r.x + r.w);
    const y0 = Math.max(rect.y, r.y);
    const y1 = Math.min(rect.y + rect.h, r.y + r.h);
    if (x1 <= x0 || y1 <= y0) continue;
    any = true;
    for (let y = y0; y < y1; y++) m.fill(0, (y - rect.y) * rect.w + (x0 - rect.x), (y - rect.y) * rect.w + (x1 - rect.x));
  }
  return any ? m : null;
}

/** Gaussian elimination with partial pivoting on a small dense system; null when singular. */
function solve(a: number[][], b: number[]): number[] | null {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i] as number]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs((m[r] as number[])[c] as number) > Math.abs((m[p] as number[])[c] as number)) p = r;
    if (!(Math.abs((m[p] as number[])[c] as number) > 1e-300)) return null;
    [m[c], m[p]] = [m[p] as number[], m[c] as number[]];
    const pivot = m[c] as number[];
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const row = m[r] as number[];
      const f = (row[c] as number) / (pivot[c] as number);
      for (let k = c; k <= n; k++) row[k] = (row[k] as number) - f * (pivot[k] as number);
    }
  }
  return m.map((row, i) => (row[n] as number) / (row[i] as number));
}

export interface WindowShift extends Offset {
  /** Window centre in the reference's pixels. */
  x: number;
  y: number;
  /** RMS residual after alignment over the RMS signal. */
  residual: number;
}

/**
 * Sub-pixel shift of one window by Lucas–Kanade with a gain and an offset: the moving photo read at
 * the current shift, m(p), is fitted as α·ref(p) + β − ∇m(p)·δ by least squares (the optics' transmission
 * and veil, or a room without the optics, change gain and offset, not the geometry), and the shift
 * moves by δ until the step is below 0.005 px. Pixels where `use` is 0 are left out.
 */
export function refineWindowShift(ref: Float32Array, readMoving: (shift: Offset) => Float32Array, rect: Rect, start: Offset, use: Uint8Array | null): WindowShift | null {
  const { w, h } = rect;
  let cur = { ...start };
  let residual = Number.NaN;
  for (let iter = 0; iter < 8; iter++) {
    const m = readMoving(cur);
    // normal equations of the regressors (r, 1, −gx, −gy) against m, summed in scalars
    let srr = 0, sr = 0, srx = 0, sry = 0, s1 = 0, sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
    let brv = 0, b1v = 0, bxv = 0, byv = 0;
    let n = 0;
    let sm = 0;
    let smm = 0;
    for (let y = 1; y < h - 1; y++) {
      for (let x = 1, i = y * w + 1; x < w - 1; x++, i++) {
        if (use && !use[i]) continue;
        const r = ref[i] as number;
        const v = m[i] as number;
        const gx = -((m[i + 1] as number) - (m[i - 1] as number)) / 2;
        const gy = -((m[i + w] as number) - (m[i - w] as number)) / 2;
        if (!(r === r && v === v && gx === gx && gy === gy)) continue;
        srr += r * r; sr += r; srx += r * gx; sry += r * gy;
        s1 += 1; sx += gx; sy += gy;
        sxx += gx * gx; sxy += gx * gy; syy += gy * gy;
        brv += r * v; b1v += v; bxv += gx * v; byv += gy * v;
        n++;
        sm += v;
        smm += v * v;
      }
    }
    const A = [[srr, sr, srx, sry], [sr, s1, sx, sy], [srx, sx, sxx, sxy], [sry, sy, sxy, syy]];
    const bv = [brv, b1v, bxv, byv];
    if (n < 64) return null;
    const p = solve(A, bv);
    if (!p || !p.every(Number.isFinite)) return null;
    const [alpha, beta, ddx, ddy] = p as [number, number, number, number];
    // residual: Σ (m − α r − β + g·δ)² from the normal equations, over the signal's variance
    let rss = smm;
    for (let a = 0; a < 4; a++) rss -= (p[a] as number) * (bv[a] as number);
    const variance = smm - (sm * sm) / n;
    residual = variance > 0 ? Math.sqrt(Math.max(0, rss) / variance) : Number.NaN;
    if (!(alpha > 0) || Math.abs(ddx) > 3 || Math.abs(ddy) > 3) return null;
    // standard errors of the shift from the residual and the normal matrix: a window with texture
    // along one direction only (a straight edge) leaves the other axis open and is not used
    const s2 = Math.max(0, rss) / Math.max(1, n - 4);
    const ex = solve(A, [0, 0, 1, 0]);
    const ey = solve(A, [0, 0, 0, 1]);
    if (!ex || !ey) return null;
    const seX = Math.sqrt(s2 * Math.max(0, ex[2] as number)) / alpha;
    const seY = Math.sqrt(s2 * Math.max(0, ey[3] as number)) / alpha;
    if (!(seX <= MAX_SHIFT_SE) || !(seY <= MAX_SHIFT_SE)) return null;
    void beta;
    cur = { dx: cur.dx + ddx, dy: cur.dy + ddy };
    if (Math.hypot(ddx, ddy) < 0.005) break;
  }
  if (Math.hypot(cur.dx - start.dx, cur.dy - start.dy) > 4) return null;
  return { ...cur, x: rect.x + (w - 1) / 2, y: rect.y + (h - 1) / 2, residual };
}

/**
 * The motion (translation at the frame's centre and a small rotation) that best explains the
 * windows' own shifts, by least squares with the small-angle model d(p) = t + θ·(−(y − cy), x − cx).
 * Fewer than three windows, or windows too close together to tell a turn, give a translation.
 */
export function fitMotion(shifts: readonly WindowShift[], width: number, height: number): { motion: Motion; spread: number } {
  const cx = (width - 1) / 2;
  const cy = (height - 1) / 2;
  const n = shifts.length;
  if (n === 0) throw new RangeError('no window shifts to fit');
  const mean = (f: (s: WindowShift) => number): number => shifts.reduce((a, s) => a + f(s), 0) / n;
  let motion: Motion = { dx: mean((s) => s.dx), dy: mean((s) => s.dy), angle: 0, cx, cy };
  const ux = shifts.map((s) => s.x - cx);
  const vy = shifts.map((s) => s.y - cy);
  const mu = ux.reduce((a, b) => a + b, 0) / n;
  const mv = vy.reduce((a, b) => a + b, 0) / n;
  let spreadR = 0;
  for (let i = 0; i < n; i++) spreadR += ((ux[i] as number) - mu) ** 2 + ((vy[i] as number) - mv) ** 2;
  if (n >= 3 && spreadR > 0.01 * (width * width + height * height) * n) {
    // unknowns tx, ty, θ: dx_i = tx − θ v_i, dy_i = ty + θ u_i
    const A = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
    const b = [0, 0, 0];
    for (let i = 0; i < n; i++) {
      const s = shifts[i] as WindowShift;
      const u = ux[i] as number;
      const v = vy[i] as number;
      for (const [row, target] of [[[1, 0, -v], s.dx], [[0, 1, u], s.dy]] as [number[], number][]) {
        for (let a = 0; a < 3; a++) {
          b[a] = (b[a] as number) + (row[a] as number) * target;
          for (let c = 0; c < 3; c++) (A[a] as number[])[c] = ((A[a] as number[])[c] as number) + (row[a] as number) * (row[c] as number);
        }
      }
    }
    const p = solve(A, b);
    if (p && p.every(Number.isFinite)) motion = { dx: p[0] as number, dy: p[1] as number, angle: Math.atan(p[2] as number), cx, cy };
  }
  let spread = 0;
  for (const s of shifts) {
    const o = offsetAt(motion, s.x, s.y);
    spread = Math.max(spread, Math.hypot(o.dx - s.dx, o.dy - s.dy));
  }
  return { motion, spread };
}

/** Windows at odds with the others are dropped one at a time (worst first) while more than 0.5 px
 * from the motion the others fit and at least three remain: a repeated pattern or a moving object
 * can pull one window's match to a wrong place. */
function dropOutliers(shifts: readonly WindowShift[], width: number, height: number): WindowShift[] {
  let kept = [...shifts];
  while (kept.length >= 4) {
    let worst = -1;
    let worstDev = 0;
    for (let i = 0; i < kept.length; i++) {
      const others = kept.filter((_, j) => j !== i);
      const m = fitMotion(others, width, height).motion;
      const s = kept[i] as WindowShift;
      const o = offsetAt(m, s.x, s.y);
      const dev = Math.hypot(o.dx - s.dx, o.dy - s.dy);
      if (dev > worstDev) { worstDev = dev; worst = i; }
    }
    if (worstDev <= 0.5) break;
    kept = kept.filter((_, j) => j !== worst);
  }
  return kept;
}

/**
 * Where `moving`'s features sit against `reference`'s (docs/method.md §5.6): phase correlation of
 * log-gradient images on the whole downsampled frame with the display's own light masked out;
 * then, at full resolution, up to four windows where both photos share the most texture (one per
 * quadrant), each put to the whole pixel by phase correlation and to a fraction of a pixel by
 * Lucas–Kanade; a translation and a small rotation fitted to the windows' shifts.
 */
export function registerPhotos(input: RegistrationInput): Registration {
  const { reference, moving, referenceSmall, movingSmall, factor, mask } = input;
  if (reference.width !== moving.width || reference.height !== moving.height) throw new RangeError('photos must have the same size');
  if (referenceSmall.width !== movingSmall.width || referenceSmall.height !== movingSmall.height) throw new RangeError('downsampled planes differ in size');
  const W = reference.width;
  const H = reference.height;
  const r = Math.max(1, Math.ceil(Math.max(referenceSmall.width, referenceSmall.height) / COARSE_SIZE));
  const scale = r * factor;
  const ra = boxDownsample(referenceSmall, r);
  const rb = boxDownsample(movingSmall, r);
  const ga = logGradient(ra);
  const gb = logGradient(rb);
  const coarseMask = maskGrid(mask, ga.width, ga.height, scale);
  const coarseMax = Math.max(1, Math.ceil(input.maxShift / scale) + 1);
  const coarse = phaseCorrelate(ga, gb, Math.min(coarseMax, ga.width, ga.height), coarseMask);
  const d0: Offset = { dx: coarse.dx * scale, dy: coarse.dy * scale };
  const cx = (W - 1) / 2;
  const cy = (H - 1) / 2;
  const fallback: Registration = { ...d0, angle: 0, cx, cy, peak: coarse.peak, runnerUp: coarse.runnerUp, windows: 0, residual: Number.NaN, spread: 0 };

  const reach = scale + 2;
  // a quarter of the frame at most, so the four windows can sit in different quadrants
  const size = Math.min(FINE_SIZE - reach, Math.floor(Math.min(W, H) / 2.5));
  if (size < 16) return fallback;
  const windows = bestWindows(ra, rb, coarse, Math.max(1, Math.round(size / scale)), coarseMask, 4);
  const shifts: WindowShift[] = [];
  const wholePixel: WindowShift[] = [];
  // The first window searches the coarse step's whole uncertainty; the others start from its
  // answer with a short reach on a smaller window (a quarter of the transform), and search again
  // with the full reach only when the match sits at the edge of the short one (a turned camera).
  let anchor: Offset | null = null;
  const SHORT = 8;
  const smallSize = Math.min(size, 128 - SHORT);
  for (const win of windows) {
    const full: Rect = { x: Math.min(W - size, win.x * scale), y: Math.min(H - size, win.y * scale), w: size, h: size };
    const attempt = (rect: Rect, from: Offset, reach: number): { start: Offset; peak: number; edge: boolean; ref: Plane } => {
      const use = windowMask(rect, mask);
      const refCrop = luminanceCrop(reference, rect, { dx: 0, dy: 0 }, 1).plane;
      const fa = logGradient(fillNaN(refCrop));
      const fb = logGradient(fillNaN(luminanceCrop(moving, rect, from, 1).plane));
      const r = Math.min(reach, rect.w - 1);
      const fine = phaseCorrelate(fa, fb, r, use);
      const ok = fine.peak >= MIN_FINE_PEAK;
      return { start: ok ? { dx: from.dx + fine.dx, dy: from.dy + fine.dy } : from, peak: fine.peak, edge: ok && (Math.abs(fine.dx) >= r || Math.abs(fine.dy) >= r), ref: refCrop };
    };
    let rect = full;
    type Attempt = { start: Offset; peak: number; edge: boolean; ref: Plane };
    let found: Attempt = anchor
      ? attempt((rect = { x: full.x + Math.floor((size - smallSize) / 2), y: full.y + Math.floor((size - smallSize) / 2), w: smallSize, h: smallSize }), { dx: Math.round(anchor.dx), dy: Math.round(anchor.dy) }, SHORT)
      : attempt(full, d0, reach);
    if (anchor && (found.edge || found.peak < MIN_FINE_PEAK)) found = attempt((rect = full), d0, reach);
    const { start, peak } = found;
    if (!anchor && peak >= MIN_FINE_PEAK) anchor = start;
    // Lucas–Kanade needs fewer pixels than the correlation's reach: the window's central part
    const lkSize = Math.min(rect.w, LK_SIZE);
    const lkRect: Rect = { x: rect.x + Math.floor((rect.w - lkSize) / 2), y: rect.y + Math.floor((rect.h - lkSize) / 2), w: lkSize, h: lkSize };
    const lkRef = lkSize === rect.w ? found.ref.data : luminanceCrop(reference, lkRect, { dx: 0, dy: 0 }, 1).plane.data;
    const lk = refineWindowShift(lkRef, (o) => warpedCrop(moving, lkRect, { ...o, angle: 0, cx: 0, cy: 0 }, 1).data, lkRect, start, windowMask(lkRect, mask));
    if (lk && lk.residual < 0.9) shifts.push(lk);
    else if (peak >= MIN_FINE_PEAK) wholePixel.push({ ...start, x: rect.x + (rect.w - 1) / 2, y: rect.y + (rect.h - 1) / 2, residual: Number.NaN });
  }
  // whole-pixel shifts only where no window could be put to a fraction of a pixel
  if (shifts.length === 0) shifts.push(...wholePixel);
  if (shifts.length === 0) return fallback;
  const kept = dropOutliers(shifts, W, H);
  const { motion, spread } = fitMotion(kept, W, H);
  const residuals = kept.map((s) => s.residual).filter(Number.isFinite);
  const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)] as number;
  return { ...motion, peak: coarse.peak, runnerUp: coarse.runnerUp, windows: kept.length, residual: residuals.length ? median(residuals) : Number.NaN, spread };
}

/**
 * The dark photo's motion against the on photo. The dark photo shares the display's light with
 * D = on − off, not the room's, so it is matched to D: coarse on the downsampled planes, then at
 * full resolution on windows over the screen's four corners (each corner fixes both axes), put to
 * the whole pixel by phase correlation and to a fraction by Lucas–Kanade.
 */
export function registerDark(input: {
  readDiff: (rect: Rect) => Float32Array;
  dark: PhotoRaster;
  darkScale: number;
  diffSmall: Plane;
  darkSmall: Plane;
  factor: number;
  maxShift: number;
  screen: Rect;
}): Registration {
  const { readDiff, dark, darkScale, diffSmall, darkSmall, factor, screen } = input;
  const W = dark.width;
  const H = dark.height;
  const coarse = registerPlanes(diffSmall, darkSmall, Math.ceil(input.maxShift / factor));
  const d0: Offset = { dx: coarse.dx * factor, dy: coarse.dy * factor };
  const cx = (W - 1) / 2;
  const cy = (H - 1) / 2;
  const fallback: Registration = { ...d0, angle: 0, cx, cy, peak: coarse.peak, runnerUp: coarse.runnerUp, windows: 0, residual: Number.NaN, spread: 0 };
  const reach = factor + 2;
  const size = Math.max(24, Math.min(160, Math.floor(Math.min(screen.w, screen.h) / 2), 2 * (reach + 24)));
  const shifts: WindowShift[] = [];
  // the four corners, then the middles of the four edges (each fixes one axis; a window left open on the other is dropped)
  const xm = screen.x + Math.floor(screen.w / 2);
  const ym = screen.y + Math.floor(screen.h / 2);
  const places = [[screen.x, screen.y], [screen.x + screen.w, screen.y], [screen.x, screen.y + screen.h], [screen.x + screen.w, screen.y + screen.h], [xm, screen.y], [xm, screen.y + screen.h], [screen.x, ym], [screen.x + screen.w, ym]] as const;
  for (const [px, py] of places) {
    const rect: Rect = { x: Math.max(0, Math.min(W - size, px - Math.floor(size / 2))), y: Math.max(0, Math.min(H - size, py - Math.floor(size / 2))), w: size, h: size };
    const ref = readDiff(rect);
    const refPlane = { data: ref, width: size, height: size };
    const fa = logGradient(fillNaN(refPlane));
    const fb = logGradient(fillNaN(luminanceCrop(dark, rect, d0, darkScale).plane));
    const fine = phaseCorrelate(fa, fb, Math.min(reach, size - 1));
    const start = fine.peak >= MIN_FINE_PEAK ? { dx: d0.dx + fine.dx, dy: d0.dy + fine.dy } : d0;
    const lk = refineWindowShift(ref, (o) => warpedCrop(dark, rect, { ...o, angle: 0, cx: 0, cy: 0 }, darkScale).data, rect, start, null);
    if (lk && lk.residual < 0.9) shifts.push(lk);
  }
  if (shifts.length === 0) return fallback;
  const kept = dropOutliers(shifts, W, H);
  const { motion, spread } = fitMotion(kept, W, H);
  const residuals = kept.map((s) => s.residual).filter(Number.isFinite).sort((a, b) => a - b);
  return { ...motion, peak: coarse.peak, runnerUp: coarse.runnerUp, windows: kept.length, residual: residuals.length ? (residuals[Math.floor((residuals.length - 1) / 2)] as number) : Number.NaN, spread };
}
