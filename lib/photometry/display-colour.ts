import { chromaticity, D65_XY, linearRgbToXyz } from './color';
import { luminanceTables } from './raster';
import type { DisplayColourResult } from './result';
import type { Offset, PhotoRaster, Rect } from './types';

/**
 * The display's colour through the optics (docs/method.md §5.12): chromaticity of its light over
 * the screen, CIE 1976 u′v′, correlated colour temperature, distance from a white, and how much the
 * colour changes over the screen.
 */

export interface Chromaticity {
  x: number;
  y: number;
}

/** CIE 1976 UCS u′v′ of a chromaticity x, y (CIE 15:2004): u′ = 4x/(−2x + 12y + 3), v′ = 9y/(−2x + 12y + 3). */
export function uvPrime(c: Chromaticity): { u: number; v: number } {
  const d = -2 * c.x + 12 * c.y + 3;
  if (!(d > 0) || !Number.isFinite(c.x) || !Number.isFinite(c.y)) throw new RangeError('chromaticity must be finite with −2x + 12y + 3 > 0');
  return { u: (4 * c.x) / d, v: (9 * c.y) / d };
}

/** Δu′v′: the distance between two chromaticities in the CIE 1976 UCS diagram. */
export function deltaUv(a: Chromaticity, b: Chromaticity): number {
  const p = uvPrime(a);
  const q = uvPrime(b);
  return Math.hypot(p.u - q.u, p.v - q.v);
}

/**
 * The Planckian locus in CIE 1960 u, v at T kelvin by Krystek's rational approximation
 * (docs/references.md; 1000–15 000 K, within about 1e-4 of the exact locus in u and v).
 */
export function planckianUv(t: number): { u: number; v: number } {
  const u = (0.860117757 + 1.54118254e-4 * t + 1.28641212e-7 * t * t) / (1 + 8.42420235e-4 * t + 7.08145163e-7 * t * t);
  const v = (0.317398726 + 4.22806245e-5 * t + 4.20481691e-8 * t * t) / (1 - 2.89741816e-5 * t + 1.61456053e-7 * t * t);
  return { u, v };
}

/**
 * Signed distance of a chromaticity from the Planckian locus in CIE 1960 u, v (Duv; positive above
 * the locus, towards green), by the nearest point of planckianUv over 1000–15 000 K.
 */
export function planckianDuv(c: Chromaticity): number {
  const { u: up, v: vp } = uvPrime(c);
  // CIE 1960: u = u′, v = 2v′/3
  const u = up;
  const v = (2 * vp) / 3;
  const dist2 = (mired: number): number => {
    const p = planckianUv(1e6 / mired);
    return (p.u - u) ** 2 + (p.v - v) ** 2;
  };
  // a coarse scan in mired (even steps along the locus), then golden-section search around the best
  const lo = 1e6 / 15000;
  const hi = 1e6 / 1000;
  let best = lo;
  let bestD = Number.POSITIVE_INFINITY;
  const steps = 200;
  for (let i = 0; i <= steps; i++) {
    const m = lo + ((hi - lo) * i) / steps;
    const d = dist2(m);
    if (d < bestD) {
      bestD = d;
      best = m;
    }
  }
  const h = (hi - lo) / steps;
  let a = Math.max(lo, best - h);
  let b = Math.min(hi, best + h);
  const g = (Math.sqrt(5) - 1) / 2;
  for (let i = 0; i < 60; i++) {
    const c1 = b - g * (b - a);
    const c2 = a + g * (b - a);
    if (dist2(c1) < dist2(c2)) b = c2;
    else a = c1;
  }
  const m = (a + b) / 2;
  const p = planckianUv(1e6 / m);
  const d = Math.sqrt(dist2(m));
  return v >= p.v ? d : -d;
}

/** Kelvin range over which McCamy's CCT is given (see cctMcCamy). */
export const CCT_RANGE = [2000, 10000] as const;
/** Farthest from the Planckian locus (|Duv|) a chromaticity may lie to have a CCT. */
export const CCT_MAX_DUV = 0.05;

/**
 * Correlated colour temperature by McCamy's cubic in n = (x − 0.3320)/(0.1858 − y) (docs/references.md):
 * within 10 K of the Planckian locus's own temperature from 2000 to 7500 K, about 85 K low at 9300 K
 * and 135 K low at 10 000 K (measured against Krystek's locus, docs/method.md §5.12). Null outside
 * 2000–10 000 K, or farther than 0.05 from the locus in Duv, where a colour temperature means little
 * (CIE 15:2004, from memory).
 */
export function cctMcCamy(c: Chromaticity): number | null {
  if (!(c.y < 0.1858 || c.y > 0.1858)) return null;
  const n = (c.x - 0.332) / (0.1858 - c.y);
  const t = 449 * n ** 3 + 3525 * n ** 2 + 6823.3 * n + 5520.33;
  if (!(t >= CCT_RANGE[0] && t <= CCT_RANGE[1])) return null;
  if (Math.abs(planckianDuv(c)) > CCT_MAX_DUV) return null;
  return t;
}

/** Mean linear R, G, B of one rectangle, with how many pixels entered it. */
export interface RgbMean {
  r: number;
  g: number;
  b: number;
  n: number;
}

/** The golden ratio's fractional part: its multiples spread evenly over [0, 1) (a low-discrepancy sequence). */
const PHI_FRACTION = (Math.sqrt(5) - 1) / 2;

/**
 * Mean linear R, G, B (unscaled) of each rectangle of a photo whose features sit `offsets[i]` away,
 * from about `budget` pixels per rectangle: whole rows, spread over the rectangle with a jitter from
 * the golden-ratio sequence so a display's periodic rows cannot fall in step with the sampling.
 * A mean over hundreds of thousands of pixels moves by far less than the colour differences it is
 * meant for; the step is 1 (every row) for small rectangles.
 */
export function sampledRgbMeans(raster: PhotoRaster, rects: readonly Rect[], offsets: readonly Offset[], budget: number): RgbMean[] {
  if (rects.length !== offsets.length) throw new RangeError('one offset per rectangle');
  if (!(budget >= 1)) throw new RangeError('budget must be at least 1 pixel');
  const { width, height, channels, data } = raster;
  const lin = luminanceTables(raster.bitDepth, raster.encoding).linear;
  return rects.map((rect, i) => {
    const o = offsets[i] as Offset;
    const x0 = Math.max(rect.x, -o.dx);
    const x1 = Math.min(rect.x + rect.w, width - o.dx);
    const rows = Math.min(rect.h, Math.max(1, Math.ceil(budget / Math.max(1, rect.w))));
    const step = rect.h / rows;
    let sr = 0;
    let sg = 0;
    let sb = 0;
    let n = 0;
    if (x1 > x0) {
      for (let k = 0; k < rows; k++) {
        const y = rect.y + Math.min(rect.h - 1, Math.floor((k + ((k * PHI_FRACTION) % 1)) * step));
        const sy = y + o.dy;
        if (sy < 0 || sy >= height) continue;
        let p = (sy * width + x0 + o.dx) * channels;
        const end = (sy * width + x1 + o.dx) * channels;
        if (channels === 3) {
          for (; p < end; p += 3) {
            sr += lin[data[p] as number] as number;
            sg += lin[data[p + 1] as number] as number;
            sb += lin[data[p + 2] as number] as number;
          }
        } else {
          for (; p < end; p++) {
            const v = lin[data[p] as number] as number;
            sr += v;
            sg += v;
            sb += v;
          }
        }
        n += x1 - x0;
      }
    }
    return n > 0 ? { r: sr / n, g: sg / n, b: sb / n, n } : { r: Number.NaN, g: Number.NaN, b: Number.NaN, n: 0 };
  });
}

/** The display's colour through the optics: the result's shape (lib/photometry/result.ts). */
export type DisplayColour = DisplayColourResult;

const r5 = (v: number): number => Math.round(v * 1e5) / 1e5;

/**
 * The display colour from its light (linear R, G, B, on a common scale) in the screen's cells: the
 * screen's chromaticity from the pixel-weighted mean of all cells, and, when `grid` is set (nine
 * cells of a full-white screen), the colour uniformity as the largest Δu′v′ between any two of them.
 * Null when the display's light is not positive in every channel sum (no colour to speak of).
 */
export function displayColourOf(cells: readonly RgbMean[], opts: { white?: Chromaticity | null; grid: boolean }): DisplayColour | null {
  let r = 0;
  let g = 0;
  let b = 0;
  let n = 0;
  for (const c of cells) {
    if (!(c.n > 0) || !Number.isFinite(c.r + c.g + c.b)) continue;
    r += c.r * c.n;
    g += c.g * c.n;
    b += c.b * c.n;
    n += c.n;
  }
  if (!(n > 0)) return null;
  const xyz = linearRgbToXyz(r / n, g / n, b / n);
  if (!(xyz.x > 0 && xyz.y > 0 && xyz.z > 0)) return null;
  const c = chromaticity(xyz);
  const uv = uvPrime(c);
  const white = opts.white ?? D65_XY;
  let uniformityDuv: number | null = null;
  if (opts.grid && cells.length === 9) {
    const uvs: { u: number; v: number }[] = [];
    for (const cell of cells) {
      const q = linearRgbToXyz(cell.r, cell.g, cell.b);
      if (!(cell.n > 0 && q.x > 0 && q.y > 0 && q.z > 0)) break;
      uvs.push(uvPrime(chromaticity(q)));
    }
    if (uvs.length === 9) {
      let worst = 0;
      for (let i = 0; i < 9; i++) for (let j = i + 1; j < 9; j++) worst = Math.max(worst, Math.hypot((uvs[i] as { u: number }).u - (uvs[j] as { u: number }).u, (uvs[i] as { v: number }).v - (uvs[j] as { v: number }).v));
      uniformityDuv = r5(worst);
    }
  }
  const cct = cctMcCamy(c);
  return {
    x: r5(c.x),
    y: r5(c.y),
    u: r5(uv.u),
    v: r5(uv.v),
    cct: cct === null ? null : Math.round(cct),
    duvFromWhite: r5(deltaUv(c, white)),
    whiteRef: opts.white ? 'display' : 'D65',
    uniformityDuv,
  };
}
