import { LUMINANCE_WEIGHTS } from '../luminance';
import { offsetAt, type Motion } from '../motion';
import { percentile } from '../percentile';
import { luminanceTables } from '../raster';
import type { EngineWarning, VeilResult } from '../result';
import { robustLine, type LineFit } from '../robust-line';
import type { PhotoRaster, Rect } from '../types';
import type { CapturePhoto, Normalised } from './normalise';

/** Side of the square blocks the fit pairs (px): the size of a JPEG block, wider than demosaicing's reach. */
export const FIT_BLOCK = 8;
/** About this many blocks are sampled over the fit region, however large the photo. */
export const FIT_TARGET_BLOCKS = 3000;
/** Fewer usable blocks than this and no line is fitted. */
export const FIT_MIN_BLOCKS = 40;
/**
 * The room's luminance over the fit region must span at least this ratio (95th over 5th percentile
 * of the block means) to tell the slope from the intercept. The veil is read at zero luminance, an
 * extrapolation of x̄/(x95 − x5) times the data's width: about 2.5 at a ratio of 1.5, 5.5 at 1.2.
 * A systematic 1% difference between the off and ambient photos (exposure drift, a tone curve
 * left in) then moves T and the relative veil by up to about that many percent, which is as much
 * as a typical veil itself (docs/method.md §5.8).
 */
export const MIN_RANGE_RATIO = 1.5;
/** A registration error up to this many pixels either way is allowed for (docs/method.md §5.8). */
export const REGISTRATION_HALF_WIDTH = 0.5;

/** What the fit gives the reading and the uncertainty stage. */
export interface SeeThroughFit {
  transmissionOptics: number | null;
  veil: VeilResult | null;
  /** Standard uncertainties of T and of the relative veil (null when the fit is not reported). */
  u: { transmissionOptics: number; veil: number } | null;
  /**
   * Noise of the off and ambient photos per unit of level, measured from the fit's residuals:
   * the variance of a region's mean over N pixels at level L is `perLevel · L / N`.
   */
  noise: { perLevel: number } | null;
}

/** Bilinear mean of a B × B block whose top-left corner sits at (x, y) (fractional), linear R, G, B into out[0..2]; false when any pixel is clipped. */
function blockRgb(raster: PhotoRaster, lin: Float64Array, clipCode: number, x: number, y: number, B: number, out: Float64Array): boolean {
  const ix = Math.floor(x);
  const iy = Math.floor(y);
  const fx = x - ix;
  const fy = y - iy;
  const { data, width, channels } = raster;
  let sr = 0;
  let sg = 0;
  let sb = 0;
  let clipped = false;
  for (let j = 0; j <= B; j++) {
    const wy = j === 0 ? 1 - fy : j === B ? fy : 1;
    if (wy === 0) continue;
    const row = (iy + j) * width;
    let rr = 0;
    let rg = 0;
    let rb = 0;
    for (let i = 0; i <= B; i++) {
      const wx = i === 0 ? 1 - fx : i === B ? fx : 1;
      if (wx === 0) continue;
      const p = (row + ix + i) * channels;
      if (channels === 1) {
        const v = data[p] as number;
        if (v >= clipCode) clipped = true;
        const l = wx * (lin[v] as number);
        rr += l;
        rg += l;
        rb += l;
      } else {
        const r = data[p] as number;
        const g = data[p + 1] as number;
        const b = data[p + 2] as number;
        if (r >= clipCode || g >= clipCode || b >= clipCode) clipped = true;
        rr += wx * (lin[r] as number);
        rg += wx * (lin[g] as number);
        rb += wx * (lin[b] as number);
      }
    }
    sr += wy * rr;
    sg += wy * rg;
    sb += wy * rb;
  }
  const area = B * B;
  out[0] = sr / area;
  out[1] = sg / area;
  out[2] = sb / area;
  return !clipped;
}

/**
 * Linear R, G, B of the (B + 2) × (B + 2) pixels from (x0, y0) into r, g, b (row-major); false when
 * any is clipped. The block means at several sub-pixel shifts are then weighted sums of these.
 */
function readWindow(raster: PhotoRaster, lin: Float64Array, clipCode: number, x0: number, y0: number, B: number, r: Float64Array, g: Float64Array, b: Float64Array): boolean {
  const { data, width, channels } = raster;
  const side = B + 2;
  let k = 0;
  for (let j = 0; j < side; j++) {
    let p = ((y0 + j) * width + x0) * channels;
    for (let i = 0; i < side; i++, k++, p += channels) {
      if (channels === 1) {
        const v = data[p] as number;
        if (v >= clipCode) return false;
        r[k] = g[k] = b[k] = lin[v] as number;
      } else {
        const cr = data[p] as number;
        const cg = data[p + 1] as number;
        const cb = data[p + 2] as number;
        if (cr >= clipCode || cg >= clipCode || cb >= clipCode) return false;
        r[k] = lin[cr] as number;
        g[k] = lin[cg] as number;
        b[k] = lin[cb] as number;
      }
    }
  }
  return true;
}

/** Bilinear mean of the B × B block starting at (x, y) of a window whose pixel (0, 0) sits at (x0, y0) (x − x0 and y − y0 in [0, 1]). */
function windowMean(v: Float64Array, x0: number, y0: number, x: number, y: number, B: number): number {
  const side = B + 2;
  const ox = Math.floor(x) - x0;
  const oy = Math.floor(y) - y0;
  const fx = x - Math.floor(x);
  const fy = y - Math.floor(y);
  let s = 0;
  for (let j = 0; j <= B; j++) {
    const wy = j === 0 ? 1 - fy : j === B ? fy : 1;
    if (wy === 0) continue;
    const row = (oy + j) * side + ox;
    let rs = (1 - fx) * (v[row] as number) + fx * (v[row + B] as number);
    for (let i = 1; i < B; i++) rs += v[row + i] as number;
    s += wy * rs;
  }
  return s / (B * B);
}

const overlaps = (a: Rect, b: Rect): boolean => a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;

/** Block positions (top-left, on-photo pixels) over the fit region, about FIT_TARGET_BLOCKS of them on an even grid. */
export function fitBlocks(region: Rect, exclude: readonly Rect[], B: number): { x: number; y: number }[] {
  // at least a block apart, so no two blocks share a JPEG coding unit and their noise is independent;
  // a region too small for FIT_MIN_BLOCKS that way is tiled (its neighbours' noise then correlates a little)
  const across = (step: number): number => (Math.floor((region.w - B) / step) + 1) * (Math.floor((region.h - B) / step) + 1);
  const sparse = Math.max(2 * B, Math.floor(Math.sqrt((region.w * region.h) / FIT_TARGET_BLOCKS)));
  const step = across(sparse) >= 2 * FIT_MIN_BLOCKS ? sparse : B;
  const out: { x: number; y: number }[] = [];
  // the grid is centred in the region, so a small background keeps its blocks away from its edges alike
  const x0 = region.x + Math.floor(((region.w - B) % step) / 2);
  const y0 = region.y + Math.floor(((region.h - B) % step) / 2);
  for (let y = y0; y + B <= region.y + region.h; y += step) {
    for (let x = x0; x + B <= region.x + region.w; x += step) {
      const block = { x, y, w: B, h: B };
      if (exclude.some((r) => overlaps(block, r))) continue;
      out.push({ x, y });
    }
  }
  return out;
}

/**
 * The see-through view is off = T·ambient + veil (docs/method.md §5.8). Over the background region,
 * or the frame outside the screen, its edge zone and the ghost when none is marked, the off photo's
 * B × B block means are fitted against the ambient photo's at the same place (both read through
 * their sub-pixel motion onto the on photo), robustly: the slope is the optics' own transmission,
 * the intercept the light they add (housing reflections, the display's stray light). Luminance for
 * the reading, and each of R, G, B for the tint. The fit is repeated with the ambient photo moved
 * half a pixel each way: half the spread of the slope (and intercept) is what a registration error
 * of that size could do.
 */
export function seeThroughFit(
  n: Normalised,
  motion: { off: Motion; ambient: Motion },
  region: { background: Rect | null; exclude: readonly Rect[] },
  cdm2PerUnit: number | null,
  warnings: EngineWarning[],
  /** Bound of the error between the off and ambient photos' registrations (px); see `registrationBound`. */
  registrationError = REGISTRATION_HALF_WIDTH,
): SeeThroughFit {
  const none: SeeThroughFit = { transmissionOptics: null, veil: null, u: null, noise: null };
  const off = n.photos.off as CapturePhoto;
  const amb = n.photos.ambient as CapturePhoto | undefined;
  if (!amb) return none;
  const B = FIT_BLOCK;
  const { width: W, height: H } = n;
  const source: 'background' | 'outside-screen' = region.background ? 'background' : 'outside-screen';
  const area = region.background ?? { x: 0, y: 0, w: W, h: H };
  const positions = fitBlocks(area, region.background ? [] : region.exclude, B);
  const tOff = luminanceTables(off.raster.bitDepth, off.raster.encoding);
  const tAmb = luminanceTables(amb.raster.bitDepth, amb.raster.encoding);
  const sOff = n.scale.off as number;
  const sAmb = n.scale.ambient as number;
  const h = REGISTRATION_HALF_WIDTH;
  // the ambient photo read at its motion and at ±h in x and y
  const shifts: [number, number][] = [[0, 0], [-h, 0], [h, 0], [0, -h], [0, h]];
  const cap = positions.length;
  const offRgb = [new Float64Array(cap), new Float64Array(cap), new Float64Array(cap)] as const;
  const ambRgb = [new Float64Array(cap), new Float64Array(cap), new Float64Array(cap)] as const;
  const offY = new Float64Array(cap);
  const ambY = shifts.map(() => new Float64Array(cap));
  const px = new Float64Array(3);
  const side = B + 2;
  const wr_ = new Float64Array(side * side);
  const wg_ = new Float64Array(side * side);
  const wb_ = new Float64Array(side * side);
  const wy_ = new Float64Array(side * side);
  const { r: wr, g: wg, b: wb } = LUMINANCE_WEIGHTS;
  let k = 0;
  for (const p of positions) {
    const cx = p.x + B / 2;
    const cy = p.y + B / 2;
    const oo = offsetAt(motion.off, cx, cy);
    const oa = offsetAt(motion.ambient, cx, cy);
    const xo = p.x + oo.dx;
    const yo = p.y + oo.dy;
    const xa = p.x + oa.dx;
    const ya = p.y + oa.dy;
    // the ambient window covers the block at ±h on both axes
    const ax0 = Math.floor(xa - h);
    const ay0 = Math.floor(ya - h);
    if (xo < 0 || yo < 0 || xo + B + 1 > W || yo + B + 1 > H) continue;
    if (ax0 < 0 || ay0 < 0 || ax0 + side > W || ay0 + side > H) continue;
    if (!blockRgb(off.raster, tOff.linear, tOff.clipCode, xo, yo, B, px)) continue;
    if (!readWindow(amb.raster, tAmb.linear, tAmb.clipCode, ax0, ay0, B, wr_, wg_, wb_)) continue;
    for (let i = 0; i < wy_.length; i++) wy_[i] = wr * (wr_[i] as number) + wg * (wg_[i] as number) + wb * (wb_[i] as number);
    const r0 = (px[0] as number) * sOff;
    const g0 = (px[1] as number) * sOff;
    const b0 = (px[2] as number) * sOff;
    offRgb[0][k] = r0;
    offRgb[1][k] = g0;
    offRgb[2][k] = b0;
    offY[k] = wr * r0 + wg * g0 + wb * b0;
    const ar = windowMean(wr_, ax0, ay0, xa, ya, B) * sAmb;
    const ag = windowMean(wg_, ax0, ay0, xa, ya, B) * sAmb;
    const ab = windowMean(wb_, ax0, ay0, xa, ya, B) * sAmb;
    ambRgb[0][k] = ar;
    ambRgb[1][k] = ag;
    ambRgb[2][k] = ab;
    (ambY[0] as Float64Array)[k] = wr * ar + wg * ag + wb * ab;
    for (let s = 1; s < shifts.length; s++) {
      const [sx, sy] = shifts[s] as [number, number];
      (ambY[s] as Float64Array)[k] = windowMean(wy_, ax0, ay0, xa + sx, ya + sy, B) * sAmb;
    }
    k++;
  }
  if (k < FIT_MIN_BLOCKS) {
    warnings.push({ code: 'see-through-unfitted', message: `only ${k} unclipped blocks of the ${source === 'background' ? 'background region' : 'room around the display'} could be paired between the off and ambient photos (at least ${FIT_MIN_BLOCKS} needed), so the optics' own transmission and the veil are not given: ${source === 'background' ? 'mark a larger background region' : 'mark a background region'} where neither photo is clipped` });
    return none;
  }
  const x = (ambY[0] as Float64Array).subarray(0, k);
  const y = offY.subarray(0, k);
  const fit = robustLine(x, y, k);
  if (!fit) {
    warnings.push({ code: 'see-through-unfitted', message: 'the room seen through the optics shows no change of level to fit the off photo against the ambient one, so the optics\' own transmission and the veil are not given: mark a background region with dark and bright objects in it' });
    return none;
  }
  let sumX = 0;
  let sumY = 0;
  for (let i = 0; i < k; i++) {
    sumX += x[i] as number;
    sumY += y[i] as number;
  }
  const meanAmb = sumX / k;
  const meanOff = sumY / k;
  // noise per unit level from the scatter about the line: residual variance σ² = ν(off + T²·ambient)/B² per block
  const levelSum = meanOff + fit.slope * fit.slope * meanAmb;
  const noise = levelSum > 0 && fit.scale > 0 ? { perLevel: (fit.scale * fit.scale * B * B) / levelSum } : null;
  const p5 = percentile(x, 5);
  const p95 = percentile(x, 95);
  const rangeRatio = p5 > 0 ? p95 / p5 : p95 > 0 ? Number.POSITIVE_INFINITY : Number.NaN;
  if (!(rangeRatio >= MIN_RANGE_RATIO) || !(meanAmb > 0)) {
    const where = source === 'background' ? 'the background region' : 'the room around the display';
    warnings.push({
      code: 'see-through-range-small',
      message: `the room's luminance over ${where} spans only ${Number.isFinite(rangeRatio) ? rangeRatio.toFixed(2) : '—'} : 1 (95th over 5th percentile; at least ${MIN_RANGE_RATIO} : 1 is needed), too little to tell the optics' own transmission from the veil, so neither is given: ${source === 'background' ? 'mark a background region' : 'mark a background region, or arrange the room,'} that takes in both dark and bright objects (a dark and a white card side by side will do)`,
    });
    return { ...none, noise };
  }
  // registration: the slope and intercept with the ambient photo half a pixel off, each way
  const shifted = [1, 2, 3, 4].map((s) => robustLine((ambY[s] as Float64Array).subarray(0, k), y, k));
  const halfSpread = (pick: (f: LineFit) => number, a: number, b: number): number => {
    const fa = shifted[a];
    const fb = shifted[b];
    return fa && fb ? Math.abs(pick(fa) - pick(fb)) / 2 : 0;
  };
  // the change per h, scaled to the registration's error bound, a rectangular distribution: u = bound/√3 (JCGM 100:2008 §4.3.7)
  const per = registrationError / h / Math.sqrt(3);
  const regT = Math.hypot(halfSpread((f) => f.slope, 0, 1), halfSpread((f) => f.slope, 2, 3)) * per;
  const regV = Math.hypot(halfSpread((f) => f.intercept, 0, 1), halfSpread((f) => f.intercept, 2, 3)) * per;
  const uT = Math.hypot(fit.uSlope, regT);
  const uV = Math.hypot(fit.uIntercept, regV);
  let channels: VeilResult['channels'] = null;
  const colour = off.raster.channels === 3 && amb.raster.channels === 3;
  if (colour) {
    const fitChannel = (c: 0 | 1 | 2): { t: number; veil: number } | null => {
      const xc = ambRgb[c].subarray(0, k);
      const f = robustLine(xc, offRgb[c].subarray(0, k), k);
      let m = 0;
      for (let i = 0; i < k; i++) m += xc[i] as number;
      m /= k;
      return f && m > 0 ? { t: f.slope, veil: f.intercept / m } : null;
    };
    const r = fitChannel(0);
    const g = fitChannel(1);
    const b = fitChannel(2);
    channels = r && g && b ? { r, g, b } : null;
  }
  return {
    transmissionOptics: fit.slope,
    veil: {
      relative: fit.intercept / meanAmb,
      cdm2: cdm2PerUnit === null ? null : fit.intercept * cdm2PerUnit,
      channels,
      rangeRatio: Number.isFinite(rangeRatio) ? rangeRatio : 1e6,
      source,
    },
    u: { transmissionOptics: uT, veil: uV / meanAmb },
    noise,
  };
}

/** The rectangles a fit over the frame leaves out: the registration mask, the screen and the ghost's place grown by the edge zone. */
export function fitExclusions(mask: readonly Rect[], screen: Rect, zone: number, ghost: { dx: number; dy: number } | null): Rect[] {
  const grow = (r: Rect, m: number): Rect => ({ x: r.x - m, y: r.y - m, w: r.w + 2 * m, h: r.h + 2 * m });
  const out = [...mask, grow(screen, zone)];
  if (ghost) out.push(grow({ ...screen, x: screen.x + Math.round(ghost.dx), y: screen.y + Math.round(ghost.dy) }, zone + 1));
  return out;
}
