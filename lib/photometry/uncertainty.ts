/**
 * Standard uncertainties (k = 1) measured from the photos themselves (docs/method.md §5.8,
 * uncertainty): the noise of block means over a region, the quantisation step at the region's
 * level, and how much a region's mean moves when the photo it is read from is off by half a pixel.
 * Propagation to ratios follows JCGM 100:2008 (GUM) §5.1.2 for uncorrelated inputs.
 */
import { percentile } from './percentile';
import { luminanceTables } from './raster';
import type { Offset, Plane, PhotoRaster, Rect } from './types';

/**
 * Blocks of at least this many pixels a side, on a grid of that pitch from the photo's corner, are
 * averaged before their scatter is taken: a JPEG's largest coding unit (16 × 16 px with 4:2:0 chroma)
 * and wider than demosaicing's reach, so neighbouring blocks share no coded block and their noise
 * is nearly independent.
 */
export const NOISE_BLOCK = 16;
/** Σ of the squared BT.709 weights: the variance of Y from three channels quantised alike, per channel variance. */
const WEIGHTS_SQUARED = 0.2126 ** 2 + 0.7152 ** 2 + 0.0722 ** 2;

/**
 * Scatter of B × B block means (B = `block` px, a multiple of the plane's `factor`) over the part of
 * a region fully covered by the plane's blocks: the robust SD of second differences
 * m[i] − (m[i−1] + m[i+1])/2 along rows and columns, divided by √1.5 (their variance is 1.5 times
 * that of independent means). A smooth level or gradient drops out; edges are outliers the median
 * ignores. NaN when the region holds too few blocks.
 */
export function blockScatter(plane: Plane, region: Rect, factor: number, offset: Offset = { dx: 0, dy: 0 }): { sigma: number; block: number } {
  const k = Math.max(1, Math.ceil(NOISE_BLOCK / factor));
  const block = k * factor;
  // a block in from the border, so the region's own blurred edge stays out when there is room
  const rect = region.w > 6 * block && region.h > 6 * block ? { x: region.x + block, y: region.y + block, w: region.w - 2 * block, h: region.h - 2 * block } : region;
  // bins start on the photo's grid of `block` px
  const sx0 = Math.max(0, Math.ceil((rect.x + offset.dx) / block) * k);
  const sy0 = Math.max(0, Math.ceil((rect.y + offset.dy) / block) * k);
  const sx1 = Math.min(plane.width, Math.floor((rect.x + rect.w + offset.dx) / factor));
  const sy1 = Math.min(plane.height, Math.floor((rect.y + rect.h + offset.dy) / factor));
  const nx = Math.floor((sx1 - sx0) / k);
  const ny = Math.floor((sy1 - sy0) / k);
  if (nx < 1 || ny < 1) return { sigma: Number.NaN, block };
  const means = new Float64Array(nx * ny);
  const { data, width } = plane;
  for (let by = 0; by < ny; by++) {
    for (let bx = 0; bx < nx; bx++) {
      let s = 0;
      for (let j = 0; j < k; j++) {
        const row = (sy0 + by * k + j) * width + sx0 + bx * k;
        for (let i = 0; i < k; i++) s += data[row + i] as number;
      }
      means[by * nx + bx] = s / (k * k);
    }
  }
  const diffs = new Float64Array(Math.max(0, ny * (nx - 2)) + Math.max(0, (ny - 2) * nx));
  let d = 0;
  for (let by = 0; by < ny; by++) {
    for (let bx = 1; bx + 1 < nx; bx++) {
      const p = by * nx + bx;
      diffs[d++] = (means[p] as number) - 0.5 * ((means[p - 1] as number) + (means[p + 1] as number));
    }
  }
  for (let by = 1; by + 1 < ny; by++) {
    for (let bx = 0; bx < nx; bx++) {
      const p = by * nx + bx;
      diffs[d++] = (means[p] as number) - 0.5 * ((means[p - nx] as number) + (means[p + nx] as number));
    }
  }
  if (d < 10) return { sigma: Number.NaN, block };
  return { sigma: clippedSigma(diffs) / Math.sqrt(1.5), block };
}

/**
 * SD of values centred on zero with a few far outliers (block differences across an edge): the
 * robust SD (1.4826 × median absolute value) to start, then the RMS of the values within 3 SD,
 * corrected for the cut (a normal cut at ±3σ keeps an SD of 0.9866σ), twice (sigma clipping, common
 * practice). The median alone reads high by about the outliers' share.
 */
export function clippedSigma(values: ArrayLike<number>): number {
  let sigma = robustSigmaAboutZero(values);
  for (let it = 0; it < 3 && sigma > 0; it++) {
    const cut = 3 * sigma;
    let s = 0;
    let n = 0;
    for (let i = 0; i < values.length; i++) {
      const v = values[i] as number;
      if (Math.abs(v) <= cut) { s += v * v; n++; }
    }
    if (n < 10) break;
    sigma = Math.sqrt(s / n) / 0.9866;
  }
  return sigma;
}

function robustSigmaAboutZero(values: ArrayLike<number>): number {
  const abs = Float64Array.from(values, Math.abs);
  return abs.length === 0 ? Number.NaN : 1.4826 * percentile(abs, 50);
}

/**
 * How a rectangle's mean over a plane changes per pixel of shift in x and y: the difference of the
 * plane's mean along its last and first columns (rows) over its width (height), read on the
 * downsampled plane (`factor`), the rectangle moved by `offset` (full-resolution px).
 */
export function borderSlopes(plane: Plane, rect: Rect, factor: number, offset: Offset = { dx: 0, dy: 0 }): { gx: number; gy: number } {
  const x0 = Math.max(0, Math.min(plane.width - 1, Math.floor((rect.x + offset.dx) / factor)));
  const x1 = Math.max(0, Math.min(plane.width - 1, Math.floor((rect.x + rect.w - 1 + offset.dx) / factor)));
  const y0 = Math.max(0, Math.min(plane.height - 1, Math.floor((rect.y + offset.dy) / factor)));
  const y1 = Math.max(0, Math.min(plane.height - 1, Math.floor((rect.y + rect.h - 1 + offset.dy) / factor)));
  const { data, width } = plane;
  const col = (x: number): number => {
    let s = 0;
    let n = 0;
    for (let y = y0; y <= y1; y++) {
      const v = data[y * width + x] as number;
      if (v === v) { s += v; n++; }
    }
    return n > 0 ? s / n : Number.NaN;
  };
  const row = (y: number): number => {
    let s = 0;
    let n = 0;
    for (let x = x0; x <= x1; x++) {
      const v = data[y * width + x] as number;
      if (v === v) { s += v; n++; }
    }
    return n > 0 ? s / n : Number.NaN;
  };
  const gx = x1 > x0 ? (col(x1) - col(x0)) / rect.w : 0;
  const gy = y1 > y0 ? (row(y1) - row(y0)) / rect.h : 0;
  return { gx: Number.isFinite(gx) ? gx : 0, gy: Number.isFinite(gy) ? gy : 0 };
}

/**
 * The registration's own error bound (px): half the largest disagreement between its windows, at
 * least 0.1 px (the step it reports shifts in, docs/method.md §5.6) and at most 0.5 px.
 */
export function registrationBound(spread: number | null | undefined): number {
  const s = typeof spread === 'number' && Number.isFinite(spread) ? spread / 2 : 0.5;
  return Math.min(0.5, Math.max(0.1, s));
}

/**
 * Standard uncertainty of a region's mean from where it is read in a photo aligned onto the on
 * photo. The mean's change per pixel of shift (`s`, half the spread of the mean re-measured at
 * ±0.5 px, per 0.5 px) times the position error bound on each axis (`ax`, `ay`: the whole-pixel
 * rounding left by the region pass plus the registration's own bound), as a rectangular
 * distribution, u = a·|slope|/√3 (JCGM 100:2008 §4.3.7), the two axes in quadrature.
 */
export function registrationU(s: { gx: number; gy: number }, ax: number, ay: number = ax): number {
  return Math.hypot(ax * s.gx, ay * s.gy) / Math.sqrt(3);
}

/**
 * Variance of the luminance of one pixel from quantisation at a level (on the photo's own scale,
 * before exposure normalisation): each channel's code step q at that level is a rectangular
 * error of q²/12 (JCGM 100:2008 §F.2.2.1), and Y sums three of them with the BT.709 weights.
 */
export function quantisationVariance(raster: Pick<PhotoRaster, 'bitDepth' | 'encoding'>, level: number): number {
  const lin = luminanceTables(raster.bitDepth, raster.encoding).linear;
  const top = lin.length - 1;
  if (!(level > 0)) return ((lin[1] as number) - (lin[0] as number)) ** 2 / 12 * WEIGHTS_SQUARED;
  // the code whose value is nearest the level (the table rises monotonically)
  let lo = 0;
  let hi = top;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if ((lin[mid] as number) <= level) lo = mid;
    else hi = mid;
  }
  const c = Math.min(top - 1, lo);
  const q = (lin[c + 1] as number) - (lin[c] as number);
  return (q * q * WEIGHTS_SQUARED) / 12;
}

/** u of a/b from the uncertainties of a and b (uncorrelated): relative uncertainties add in quadrature (GUM §5.1.6). */
export function ratioU(a: number, ua: number, b: number, ub: number): number {
  const r = a / b;
  return Math.abs(r) * Math.hypot(ua / a, ub / b);
}

/** u of (a − b)/(a + b): ∂/∂a = 2b/(a + b)², ∂/∂b = −2a/(a + b)² (GUM §5.1.2). */
export function michelsonU(a: number, ua: number, b: number, ub: number): number {
  const s = (a + b) * (a + b);
  return Math.hypot((2 * b * ua) / s, (2 * a * ub) / s);
}
