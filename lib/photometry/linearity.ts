import { measureRects, totalsMean } from './region-pass';
import type { PhotoRaster, Rect } from './types';

/** Fitted exponents further than this from 1 mean the camera bends its tone scale. */
export const LINEARITY_EXPONENT_TOLERANCE = 0.08;
/** Largest deviation of one step from the straight line that still passes. */
export const LINEARITY_MAX_DEVIATION = 0.06;

export interface LinearityFit {
  /** Measured step levels, black step subtracted, scaled so the fitted line has slope 1. */
  normalised: number[];
  /** Expected step levels relative to the brightest step. */
  expected: number[];
  /** γ in measured ∝ expected^γ (1 for a linear camera). */
  exponent: number;
  /** Largest |measured/expected − 1| over the steps used, against a line through the origin. */
  maxDeviation: number;
  /** Indices of the steps that took part in the fit. */
  used: number[];
  linear: boolean;
  /** Set when the camera applies a tone curve: what to do about it. */
  warning: string | null;
}

/**
 * Fits measured grey-step levels against their expected linear values. The darkest step is taken
 * as the black level (display black plus flare) and subtracted; steps that are clipped, or at or
 * under black, are left out.
 */
export function fitLinearity(measured: readonly number[], expected: readonly number[], clipped: readonly boolean[] = []): LinearityFit {
  if (measured.length !== expected.length) throw new RangeError(`${measured.length} measured steps against ${expected.length} expected`);
  if (measured.length < 4) throw new RangeError('a linearity check needs at least 4 steps');
  if (![...measured, ...expected].every(Number.isFinite)) throw new RangeError('step levels must be finite numbers');
  const order = expected.map((_, i) => i).sort((a, b) => (expected[a] as number) - (expected[b] as number));
  const blackIdx = order[0] as number;
  const black = measured[blackIdx] as number;
  const eBlack = expected[blackIdx] as number;
  const eTop = Math.max(...expected) - eBlack;
  if (!(eTop > 0)) throw new RangeError('the expected steps must not all be equal');
  const used: number[] = [];
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < measured.length; i++) {
    if (i === blackIdx || clipped[i]) continue;
    const e = ((expected[i] as number) - eBlack) / eTop;
    const m = (measured[i] as number) - black;
    if (!(e > 0) || !(m > 0)) continue;
    used.push(i);
    xs.push(e);
    ys.push(m);
  }
  if (used.length < 3) throw new RangeError('fewer than 3 usable steps: the pattern is clipped or too dark; expose for the white step just under clipping');
  // least squares of log m = a + γ·log e
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  for (let j = 0; j < xs.length; j++) {
    const lx = Math.log(xs[j] as number);
    const ly = Math.log(ys[j] as number);
    sx += lx;
    sy += ly;
    sxx += lx * lx;
    sxy += lx * ly;
  }
  const nUsed = xs.length;
  const den = nUsed * sxx - sx * sx;
  const exponent = den > 0 ? (nUsed * sxy - sx * sy) / den : Number.NaN;
  // line through the origin: slope = Σxy/Σx²
  let num = 0;
  let dd = 0;
  for (let j = 0; j < xs.length; j++) {
    num += (xs[j] as number) * (ys[j] as number);
    dd += (xs[j] as number) * (xs[j] as number);
  }
  const slope = num / dd;
  const normalised = measured.map((m) => (m - black) / slope);
  const expectedRel = expected.map((e) => (e - eBlack) / eTop);
  let maxDeviation = 0;
  for (const i of used) maxDeviation = Math.max(maxDeviation, Math.abs((normalised[i] as number) / (expectedRel[i] as number) - 1));
  const linear = Number.isFinite(exponent) && Math.abs(exponent - 1) <= LINEARITY_EXPONENT_TOLERANCE && maxDeviation <= LINEARITY_MAX_DEVIATION;
  const warning = linear
    ? null
    : `the camera applies a tone curve (fitted exponent ${exponent.toFixed(2)}, 1.00 is linear; worst step ${(100 * maxDeviation).toFixed(0)}% off the line): its JPEGs are unfit for photometry. Shoot in manual mode with HDR, dynamic-range and auto-contrast features off, or convert raw files to 16-bit TIFF`;
  return { normalised, expected: expectedRel, exponent, maxDeviation, used, linear, warning };
}

export interface GreyStepReading {
  /** Mean Y of each band's central 50% × 50%, left to right. */
  levels: number[];
  clipped: boolean[];
  cells: Rect[];
}

/**
 * Reads a photo of the grey-steps pattern: `steps` equal vertical bands across `area` (the
 * pattern's rectangle in the photo), each measured over its central half to stay clear of blur.
 */
export function readGreySteps(raster: PhotoRaster, area: Rect, steps: number): GreyStepReading {
  if (!Number.isInteger(steps) || steps < 2) throw new RangeError(`steps must be an integer ≥ 2, got ${steps}`);
  if (![area.x, area.y, area.w, area.h].every(Number.isInteger) || area.x < 0 || area.y < 0 || area.x + area.w > raster.width || area.y + area.h > raster.height) {
    throw new RangeError(`the pattern area must be whole pixels inside the ${raster.width} × ${raster.height} photo`);
  }
  if (area.w < 4 * steps || area.h < 4) throw new RangeError(`the pattern area ${area.w} × ${area.h} px is too small for ${steps} steps: at least ${4 * steps} × 4 px`);
  const cells: Rect[] = [];
  for (let i = 0; i < steps; i++) {
    const x0 = area.x + Math.round((i * area.w) / steps);
    const x1 = area.x + Math.round(((i + 1) * area.w) / steps);
    const w = x1 - x0;
    cells.push({ x: x0 + Math.floor(w / 4), y: area.y + Math.floor(area.h / 4), w: Math.max(1, Math.round(w / 2)), h: Math.max(1, Math.round(area.h / 2)) });
  }
  const totals = measureRects(raster, cells.map((rect) => ({ rect })), { dx: 0, dy: 0 }, 1);
  return {
    levels: totals.map(totalsMean),
    // more than 0.1% of a cell clipped spoils its mean (docs/method.md §5.5)
    clipped: totals.map((t) => t.n > 0 && t.clipped / t.n > 0.001),
    cells,
  };
}
