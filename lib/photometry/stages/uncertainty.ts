import { offsetAt, scaleMotion, type Motion } from '../motion';
import type { CaptureResult, GhostAndUniformity, UncertainMetric } from '../result';
import type { Plane, PhotoRaster, PhotoRole, Rect } from '../types';
import { blockScatter, borderSlopes, michelsonU, quantisationVariance, ratioU, registrationBound, registrationU } from '../uncertainty';
import type { Aligned } from './align';
import type { Levels, Regions } from './measure';
import type { CapturePhoto, Normalised } from './normalise';
import type { SeeThroughFit } from './see-through-fit';

export interface UncertaintyInput {
  n: Normalised;
  a: Aligned;
  regions: Regions;
  levels: Levels;
  pattern: CaptureResult['pattern'];
  /** The variant the main keys report (the dark one when there is a dark photo), and its plane of D. */
  primary: GhostAndUniformity;
  primaryPlane: { plane: Plane; dark: boolean };
  transmission: number | null;
  seeThroughMeans: { off: number; ambient: number } | null;
  fit: SeeThroughFit;
}

const area = (r: Rect): number => r.w * r.h;

/** Bilinear resampling leaves a block mean's noise variance times this factor (one axis, shift fraction f, k small pixels a block). */
function warpVarianceFactor(f: number, k: number): number {
  const g = Math.abs(f - Math.round(f));
  return ((1 - g) ** 2 + (k - 1) + g * g) / k;
}

/**
 * The standard uncertainty of every metric the reading gives (docs/method.md §5.8, uncertainty).
 *
 * Noise: over the screen, the room is the same in the on and off photos, so D = on − off holds only
 * the display's smooth light and the two photos' noise; the scatter of D's 8 px block means gives
 * their summed variance, shared between the photos in proportion to their levels (photon noise,
 * whose variance grows with the signal, dominates a camera's noise above a few percent of full
 * scale: common practice). Over the see-through area the same holds for the residuals of the fit of
 * off against ambient. A region's mean over N pixels at level L then has variance ν·L/N, never less
 * than the quantisation's. Registration: each region of a photo aligned onto the on photo is read
 * at a whole-pixel shift, so its mean may be off by what half a pixel's shift does to it.
 */
export function uncertainties(u: UncertaintyInput): Partial<Record<UncertainMetric, number>> {
  const { n, a, regions, levels } = u;
  const out: Partial<Record<UncertainMetric, number>> = {};
  const factor = n.factor;
  const screen = regions.screen;
  const rasterOf = (role: PhotoRole): PhotoRaster => (n.photos[role] as CapturePhoto).raster;
  const scale = (role: PhotoRole): number => n.scale[role] as number;
  /** Quantisation variance of one pixel at a level on the on photo's scale. */
  const qVar = (role: PhotoRole, level: number): number => quantisationVariance(rasterOf(role), level / scale(role)) * scale(role) ** 2;

  // noise per unit level from D over the screen
  const offMotion = a.motion.off as Motion;
  const dScatter = blockScatter(a.diffSmall, screen, factor);
  const k = dScatter.block / factor;
  const so = scaleMotion(offMotion, factor);
  const oc = offsetAt(so, (screen.x + screen.w / 2) / factor, (screen.y + screen.h / 2) / factor);
  const gamma = warpVarianceFactor(oc.dx, k) * warpVarianceFactor(oc.dy, k);
  const levelSum = levels.lOn + gamma * Math.max(0, levels.lOff);
  const nuD = Number.isFinite(dScatter.sigma) && levelSum > 0 ? (dScatter.sigma ** 2 * dScatter.block ** 2) / levelSum : 0;
  // the room seen through the optics, fitted off against ambient, leaves only the two photos' noise
  // in its residuals; the display's own structure over the screen (its fall-off, a ghost's edge)
  // would read as noise in D, so the fit's measure is preferred when there is one
  const nu = u.fit.noise?.perLevel ?? nuD;
  /** Variance of a region's mean over N px at a level in one photo. */
  const meanVar = (role: PhotoRole, nu: number, level: number, N: number): number => Math.max(nu * Math.max(0, level), qVar(role, level)) / N;
  /** Position error bounds (px) of a region read from a role's photo at its whole-pixel shift. */
  const bounds = (role: PhotoRole, r: Rect): { ax: number; ay: number; whole: { dx: number; dy: number } } => {
    const m = a.motion[role];
    if (!m) return { ax: 0, ay: 0, whole: { dx: 0, dy: 0 } };
    const o = offsetAt(m, r.x + (r.w - 1) / 2, r.y + (r.h - 1) / 2);
    const whole = { dx: Math.round(o.dx), dy: Math.round(o.dy) };
    const d = registrationBound(m.spread);
    return { ax: Math.abs(o.dx - whole.dx) + d, ay: Math.abs(o.dy - whole.dy) + d, whole };
  };
  const regOff = (r: Rect): number => {
    const b = bounds('off', r);
    return registrationU(borderSlopes(a.offSmall, r, factor), b.ax, b.ay);
  };

  // contrast ratio and Michelson over the screen
  const N = area(screen);
  const uOn = Math.sqrt(meanVar('on', nu, levels.lOn, N));
  const uOff = Math.hypot(Math.sqrt(meanVar('off', nu, levels.lOff, N)), regOff(screen));
  if (levels.acr !== null && levels.lOff > 0) out.ambientContrastRatio = ratioU(levels.lOn, uOn, levels.lOff, uOff);
  if (u.pattern === 'full' && levels.michelson !== null) out.michelson = michelsonU(levels.lOn, uOn, levels.lOff, uOff);
  if (levels.checker && regions.checker) {
    // 8 cells a group, each over its central 50%, read from the on photo alone
    const nCell = 8 * area(regions.checker[0] as Rect);
    const { white, black } = levels.checker;
    const uW = Math.sqrt(meanVar('on', nu, white, nCell));
    const uB = Math.sqrt(meanVar('on', nu, black, nCell));
    if (levels.ansi !== null && black > 0) out.ansiContrast = ratioU(white, uW, black, uB);
    if (levels.michelson !== null) out.michelson = michelsonU(white, uW, black, uB);
  }

  // uniformity: the smallest over the largest of the nine cells of D
  const cellsD = u.primary.uniformityCells;
  if (u.primary.uniformity !== null && cellsD && regions.cells) {
    const cellRects = regions.cells;
    let cellU: (i: number) => number;
    if (u.primaryPlane.dark) {
      const s = blockScatter(u.primaryPlane.plane, screen, factor);
      const v = Number.isFinite(s.sigma) ? s.sigma ** 2 * s.block ** 2 : 0;
      cellU = (i) => {
        const r = cellRects[i] as Rect;
        const b = bounds('dark', r);
        return Math.hypot(Math.sqrt(Math.max(v, qVar('dark', cellsD[i] as number)) / area(r)), registrationU(borderSlopes(u.primaryPlane.plane, r, factor), b.ax, b.ay));
      };
    } else {
      cellU = (i) => {
        const r = cellRects[i] as Rect;
        const d = cellsD[i] as number;
        const noise = meanVar('on', nu, d + levels.lOff, area(r)) + meanVar('off', nu, levels.lOff, area(r));
        return Math.hypot(Math.sqrt(noise), regOff(r));
      };
    }
    let lo = 0;
    let hi = 0;
    cellsD.forEach((c, i) => {
      if (c < (cellsD[lo] as number)) lo = i;
      if (c > (cellsD[hi] as number)) hi = i;
    });
    out.uniformity = lo === hi ? 0 : ratioU(cellsD[lo] as number, cellU(lo), cellsD[hi] as number, cellU(hi));
  }

  // ghost: its one-sided excess over its standard error (the scatter of the mirrored band's block means)
  const g = u.primary.ghost;
  if (g && g.snr !== null && g.snr > 0) out.ghostRatio = Math.abs(g.ratio) / g.snr;

  // transmission: off over ambient over the see-through region
  if (u.transmission !== null && u.seeThroughMeans && n.photos.ambient) {
    const r = regions.seeThrough;
    const { off: lo, ambient: la } = u.seeThroughMeans;
    const b = bounds('ambient', r);
    const regAmb = registrationU(borderSlopes(n.small.ambient as Plane, r, factor, b.whole), b.ax, b.ay);
    const uLo = Math.hypot(Math.sqrt(meanVar('off', nu, lo, area(r))), regOff(r));
    const uLa = Math.hypot(Math.sqrt(meanVar('ambient', nu, la, area(r))), regAmb);
    out.transmission = ratioU(lo, uLo, la, uLa);
  }
  if (u.fit.u && u.fit.transmissionOptics !== null) out.transmissionOptics = u.fit.u.transmissionOptics;
  if (u.fit.u && u.fit.veil) out.veil = u.fit.u.veil;
  for (const key of Object.keys(out) as UncertainMetric[]) {
    const v = out[key] as number;
    if (!Number.isFinite(v)) delete out[key];
  }
  return out;
}
