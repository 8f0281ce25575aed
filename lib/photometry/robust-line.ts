import { percentile } from './percentile';

/**
 * A straight line y = a + b·x fitted robustly to a few thousand points: Theil–Sen on an even
 * subsample for the start, then iteratively reweighted least squares with Tukey's biweight, and
 * the standard errors of both coefficients from the weighted fit (docs/method.md §5.8, the optics'
 * transmission and veil).
 */

/** Tukey's biweight constant: 95% efficiency at normal errors (Beaton & Tukey 1974, docs/references.md). */
export const BIWEIGHT_C = 4.685;
/** Points of the Theil–Sen start (pairs grow with its square). */
const START_POINTS = 100;
const MAX_ITERATIONS = 30;
/** The iterations stop when the slope and intercept move by less than this share of their scale. */
const TOLERANCE = 1e-9;

export interface LineFit {
  /** Intercept a and slope b. */
  intercept: number;
  slope: number;
  /** Standard uncertainties of a and b from the scatter about the line (sandwich form of the weighted fit). */
  uIntercept: number;
  uSlope: number;
  /** Robust SD of the residuals (1.4826 × their median absolute value). */
  scale: number;
  /** Points given, and the weighted mean of x. */
  n: number;
  xMean: number;
}

// by selection, in linear time: a fit takes a median per iteration
const median = (a: ArrayLike<number>): number => percentile(a, 50);

/** Theil–Sen: the median of the slopes between pairs, the median of y − b·x for the intercept (Sen 1968). */
function theilSen(x: Float64Array, y: Float64Array, n: number): { a: number; b: number } {
  const step = Math.max(1, Math.floor(n / START_POINTS));
  const idx: number[] = [];
  for (let i = 0; i < n; i += step) idx.push(i);
  const slopes: number[] = [];
  for (let p = 0; p < idx.length; p++) {
    const i = idx[p] as number;
    for (let q = p + 1; q < idx.length; q++) {
      const j = idx[q] as number;
      const dx = (x[j] as number) - (x[i] as number);
      if (dx !== 0) slopes.push(((y[j] as number) - (y[i] as number)) / dx);
    }
  }
  const b = slopes.length > 0 ? median(slopes) : 0;
  const r = new Float64Array(n);
  for (let i = 0; i < n; i++) r[i] = (y[i] as number) - b * (x[i] as number);
  return { a: median(r), b };
}

/**
 * The robust line through the first `n` points of x and y (null when fewer than 3 points or no
 * spread in x). Outliers (edges misaligned between the photos, a reflection) get weight 0 beyond
 * BIWEIGHT_C robust SDs.
 */
export function robustLine(x: Float64Array, y: Float64Array, n = x.length): LineFit | null {
  if (n < 3) return null;
  let { a, b } = theilSen(x, y, n);
  const r = new Float64Array(n);
  const w = new Float64Array(n);
  let scale = 0;
  for (let it = 0; it < MAX_ITERATIONS; it++) {
    for (let i = 0; i < n; i++) r[i] = (y[i] as number) - a - b * (x[i] as number);
    for (let i = 0; i < n; i++) w[i] = Math.abs(r[i] as number);
    scale = 1.4826 * median(w);
    if (!(scale > 0)) {
      // an exact line (noise-free input): every point on it counts fully
      for (let i = 0; i < n; i++) w[i] = 1;
    } else {
      const c = BIWEIGHT_C * scale;
      for (let i = 0; i < n; i++) {
        const u = (r[i] as number) / c;
        w[i] = Math.abs(u) < 1 ? (1 - u * u) * (1 - u * u) : 0;
      }
    }
    let sw = 0;
    let swx = 0;
    let swy = 0;
    for (let i = 0; i < n; i++) {
      const wi = w[i] as number;
      sw += wi;
      swx += wi * (x[i] as number);
      swy += wi * (y[i] as number);
    }
    if (!(sw > 0)) return null;
    const mx = swx / sw;
    const my = swy / sw;
    let sxx = 0;
    let sxy = 0;
    for (let i = 0; i < n; i++) {
      const wi = w[i] as number;
      const dx = (x[i] as number) - mx;
      sxx += wi * dx * dx;
      sxy += wi * dx * ((y[i] as number) - my);
    }
    if (!(sxx > 0)) return null;
    const nb = sxy / sxx;
    const na = my - nb * mx;
    const done = Math.abs(nb - b) <= TOLERANCE * Math.max(1e-3, Math.abs(nb)) && Math.abs(na - a) <= TOLERANCE * Math.max(1e-3 * Math.abs(my), Math.abs(na));
    a = na;
    b = nb;
    if (done) break;
  }
  // sandwich covariance of the weighted fit: σ²·A⁻¹·B·A⁻¹, A = XᵀWX, B = XᵀW²X (common practice for M-estimators)
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let t0 = 0;
  let t1 = 0;
  let t2 = 0;
  for (let i = 0; i < n; i++) {
    const wi = w[i] as number;
    const xi = x[i] as number;
    s0 += wi;
    s1 += wi * xi;
    s2 += wi * xi * xi;
    t0 += wi * wi;
    t1 += wi * wi * xi;
    t2 += wi * wi * xi * xi;
  }
  const det = s0 * s2 - s1 * s1;
  if (!(det > 0)) return null;
  // A⁻¹ = [[s2, −s1], [−s1, s0]] / det
  const i00 = s2 / det;
  const i01 = -s1 / det;
  const i11 = s0 / det;
  // C = A⁻¹ B A⁻¹
  const m00 = i00 * t0 + i01 * t1;
  const m01 = i00 * t1 + i01 * t2;
  const m10 = i01 * t0 + i11 * t1;
  const m11 = i01 * t1 + i11 * t2;
  const c00 = m00 * i00 + m01 * i01;
  const c11 = m10 * i01 + m11 * i11;
  const sigma2 = scale * scale;
  return { intercept: a, slope: b, uIntercept: Math.sqrt(Math.max(0, sigma2 * c00)), uSlope: Math.sqrt(Math.max(0, sigma2 * c11)), scale, n, xMean: s1 / s0 };
}
