import { detectScreen, strided } from '../detect-screen';
import { EngineInputError } from '../errors';
import { growRect } from '../band';
import { largestDisplacement, scaleMotion, type Motion } from '../motion';
import { percentile, robustSigma } from '../percentile';
import { registerDark, registerPhotos, type Registration } from '../register';
import type { EngineWarning } from '../result';
import { diffReader, measureEdgeSpread, refineScreenEdgesWith, type DiffReader, type EdgeSource, type EdgeSpread } from '../screen-edges';
import { subtractPlanes } from '../shift-plane';
import type { Offset, Plane, PhotoRole, Rect } from '../types';
import { warpPlane } from '../warp';
import { cached, type AnalysisMemo } from './memo';
import type { CapturePhoto, Normalised } from './normalise';

/** Camera movement beyond this share of the width means the photos do not show the same view. */
export const MAX_SHIFT_SHARE = 0.05;
/** A camera turned by this much or more between photos is reported (degrees). */
export const ROTATION_WARN_DEG = 0.1;
/**
 * Above this turn (degrees) the photos are refused: regions are aligned by their local shift, which
 * leaves a rectangle's corners up to θ·(half its diagonal) off; at 1° that is 17 px on a 2000 px
 * screen, more than the edge zone absorbs.
 */
export const ROTATION_MAX_DEG = 1;

/** The second stage's result: every photo's motion against the on photo, the screen, and the difference D. */
export interface Aligned {
  motion: Partial<Record<PhotoRole, Registration>>;
  screen: Rect;
  screenSource: 'marked' | 'detected';
  /** D = on − off (aligned) at the small planes' resolution, and the aligned off plane. */
  diffSmall: Plane;
  offSmall: Plane;
  /** Robust noise sigma of diffSmall. */
  diffSigma: number;
  /** D = on − off at full resolution, read through the off photo's motion. */
  readDiff: DiffReader;
  /** The screen's edge spread measured on D. */
  spread: EdgeSpread;
  /** The rectangles left out of the registration. */
  mask: Rect[];
  warnings: EngineWarning[];
}

const motionKey = (m: Motion): string => `${m.dx.toFixed(4)},${m.dy.toFixed(4)},${m.angle.toExponential(4)}`;

/** Full-resolution reader of a role's luminance through its motion. */
export function sourceOf(n: Normalised, role: PhotoRole, m: Motion | null): EdgeSource {
  const p = n.photos[role] as CapturePhoto;
  return m ? { raster: p.raster, offset: { dx: 0, dy: 0 }, motion: m, scale: n.scale[role] as number } : { raster: p.raster, offset: { dx: 0, dy: 0 }, scale: n.scale[role] as number };
}

/**
 * The display's own light, left out of the registration: the screen grown by a margin (its edge
 * spread, and a block or two of detection slack), the marked ghost's place, and the ring a ghost
 * search covers (a quarter of the screen's size around it) while enough of the frame is left.
 */
export function displayMask(screen: Rect, width: number, height: number, factor: number, ghost: Offset | null): Rect[] {
  const margin = Math.max(3 * factor, Math.ceil(0.015 * Math.max(width, height)));
  const rects = [growRect(screen, margin) as Rect];
  if (ghost) rects.push(growRect({ ...screen, x: screen.x + ghost.dx, y: screen.y + ghost.dy }, margin) as Rect);
  const ring = { x: screen.x - Math.ceil(screen.w / 4) - margin, y: screen.y - Math.ceil(screen.h / 4) - margin, w: screen.w + 2 * Math.ceil(screen.w / 4) + 2 * margin, h: screen.h + 2 * Math.ceil(screen.h / 4) + 2 * margin };
  const x0 = Math.max(0, ring.x);
  const y0 = Math.max(0, ring.y);
  const covered = (Math.min(width, ring.x + ring.w) - x0) * (Math.min(height, ring.y + ring.h) - y0);
  if (covered <= 0.65 * width * height) rects.push(ring);
  return rects;
}

function checkMotion(role: PhotoRole, m: Registration, width: number, height: number, warnings: EngineWarning[]): void {
  const worst = largestDisplacement(m, width, height);
  if (worst > MAX_SHIFT_SHARE * width) {
    throw new EngineInputError('camera-moved', `the camera moved ${worst.toFixed(0)} px between the on and ${role} photos (more than 5% of the width): reshoot from a tripod`);
  }
  const deg = (m.angle * 180) / Math.PI;
  if (Math.abs(deg) > ROTATION_MAX_DEG) {
    throw new EngineInputError('camera-moved', `the camera turned by ${deg.toFixed(2)}° between the on and ${role} photos (more than ${ROTATION_MAX_DEG}°): lock the tripod head and reshoot`);
  }
  const dist = Math.hypot(m.dx, m.dy);
  if (dist > 1) warnings.push({ code: 'shifted', message: `the ${role} photo is shifted by ${m.dx.toFixed(1)},${m.dy.toFixed(1)} px against the on photo; aligned` });
  if (Math.abs(deg) >= ROTATION_WARN_DEG) {
    warnings.push({ code: 'rotated', message: `the ${role} photo is turned by ${deg.toFixed(2)}° against the on photo (the tripod head moved between the shots): each region is aligned by its own shift, which leaves its corners up to a pixel or two off; lock the head and reshoot for the best figures` });
  }
  if (m.windows === 0 || m.peak < 1.25 * m.runnerUp || m.spread > 1 || m.residual > 0.6) {
    warnings.push({ code: 'registration-uncertain', message: `the alignment of the ${role} photo is uncertain (correlation peak ${m.peak.toFixed(3)} against ${m.runnerUp.toFixed(3)} elsewhere, ${m.windows} window${m.windows === 1 ? '' : 's'} agreeing within ${m.spread.toFixed(1)} px): make sure the room behind the optics has texture outside the display, and that nothing moved between the photos` });
  }
}

/** Registration of off, ambient and dark with the display masked out, the screen marked or detected, and its edge spread. */
export function alignAndLocate(n: Normalised, opts: { screen?: Rect | null; ghostOffset?: Offset | 'none' | null }, memo: AnalysisMemo | null): Aligned {
  const { width: W, height: H, factor } = n;
  const warnings: EngineWarning[] = [];
  const on = n.photos.on as CapturePhoto;
  const maxShift = Math.ceil(2 * MAX_SHIFT_SHARE * W) + 2;
  // A merged bracket keeps a display far brighter than the room; registration's log floor (a share
  // of the brightest level) would then flatten the room it locks onto. Capping both planes a little
  // above the off photo's brightest room level gives it back the view a single exposure has.
  const bracketed = n.roles.some((r) => n.photos[r]?.bracket);
  let regCap = Number.POSITIVE_INFINITY;
  if (bracketed) {
    regCap = 4 * percentile(strided((n.small.off as Plane).data, 100_000), 99);
    if (!(regCap > 0)) regCap = Number.POSITIVE_INFINITY;
  }
  const regSmall = (role: PhotoRole): Plane => {
    const p = n.small[role] as Plane;
    if (!Number.isFinite(regCap)) return p;
    return cached(memo, `capped:${n.key[role]}:${regCap}`, () => ({ data: p.data.map((v) => (v > regCap ? regCap : v)), width: p.width, height: p.height }));
  };
  const marked = opts.ghostOffset && opts.ghostOffset !== 'none' ? opts.ghostOffset : null;
  const register = (role: 'off' | 'ambient', mask: Rect[] | null, coarseOnly = false): Registration =>
    cached(memo, `register:${n.key.on}:${n.key[role]}:${factor}:${maxShift}:${regCap}:${coarseOnly}:${mask ? mask.map((r) => `${r.x},${r.y},${r.w},${r.h}`).join(';') : '-'}`, () =>
      registerPhotos({ reference: on.raster, moving: (n.photos[role] as CapturePhoto).raster, referenceSmall: regSmall('on'), movingSmall: regSmall(role), factor, maxShift, mask, coarseOnly }),
    );
  const diffOf = (m: Motion): { offSmall: Plane; diffSmall: Plane; sigma: number } =>
    cached(memo, `diff:${n.key.on}:${n.key.off}:${motionKey(m)}`, () => {
      const offSmall = warpPlane(n.small.off as Plane, scaleMotion(m, factor));
      const diffSmall = subtractPlanes(n.small.on as Plane, offSmall);
      return { offSmall, diffSmall, sigma: robustSigma(strided(diffSmall.data, 200_000)) };
    });
  const detect = (d: { diffSmall: Plane; sigma: number }, key: string): Rect => {
    const found = cached(memo, `detect:${key}`, () => detectScreen(d.diffSmall, d.sigma));
    if (!found) {
      throw new EngineInputError('no-screen-found', 'no display light found between the on and off photos: the display looks off in the on photo, or the exposure or room light changed between the photos. Check the display shows the pattern in the on photo and is dark in the off photo, keep the exposure fixed, or mark the screen region');
    }
    const x0 = found.x * factor;
    const y0 = found.y * factor;
    const x1 = Math.min(W, (found.x + found.w) * factor);
    const y1 = Math.min(H, (found.y + found.h) * factor);
    return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
  };

  let screen: Rect;
  let screenSource: 'marked' | 'detected';
  let offMotion: Registration;
  let mask: Rect[];
  let firstMotion: Motion = { dx: Number.NaN, dy: Number.NaN, angle: 0, cx: 0, cy: 0 };
  if (opts.screen) {
    screen = { ...opts.screen };
    screenSource = 'marked';
    mask = displayMask(screen, W, H, factor, marked);
    offMotion = register('off', mask);
  } else {
    // a first alignment without a mask finds the display well enough to mask it for the real one
    const first = register('off', null, true);
    firstMotion = first;
    const coarse = detect(diffOf(first), `${n.key.on}:${n.key.off}:${motionKey(first)}`);
    mask = displayMask(coarse, W, H, factor, marked);
    offMotion = register('off', mask);
    screenSource = 'detected';
    screen = coarse;
  }
  const d = diffOf(offMotion);
  const onSrc = sourceOf(n, 'on', null);
  const offSrc = sourceOf(n, 'off', offMotion);
  const readDiff = diffReader(onSrc, offSrc);
  if (screenSource === 'detected') {
    // the first look's detection stands when the masked registration moved the off photo by less than half a block
    const moved = Math.hypot(offMotion.dx - firstMotion.dx, offMotion.dy - firstMotion.dy) + largestDisplacement({ ...offMotion, dx: 0, dy: 0 }, W, H);
    const coarse = moved < factor / 2 ? screen : detect(d, `${n.key.on}:${n.key.off}:${motionKey(offMotion)}`);
    screen = cached(memo, `edges:${n.key.on}:${n.key.off}:${motionKey(offMotion)}:${coarse.x},${coarse.y},${coarse.w},${coarse.h}`, () => refineScreenEdgesWith(coarse, readDiff, { width: W, height: H }, factor));
    if (screen.w * screen.h > 0.8 * W * H) {
      throw new EngineInputError('no-screen-found', `the on and off photos differ over ${Math.round((100 * screen.w * screen.h) / (W * H))}% of the frame: either the display fills the view (move back or zoom out so the room shows around it, and mark the screen) or the exposure or room light changed between the photos (keep them fixed)`);
    }
  } else if (screen.w * screen.h > 0.8 * W * H) {
    warnings.push({ code: 'screen-fills-frame', message: `the screen region covers ${Math.round((100 * screen.w * screen.h) / (W * H))}% of the frame: too little room is left around it to align the photos and to look for a ghost; move back or zoom out so the room shows around the display` });
  }
  const motion: Partial<Record<PhotoRole, Registration>> = { off: offMotion };
  checkMotion('off', offMotion, W, H, warnings);
  if (n.photos.ambient) {
    const m = register('ambient', mask);
    checkMotion('ambient', m, W, H, warnings);
    motion.ambient = m;
  }
  if (n.photos.dark) {
    const dark = n.photos.dark;
    const m = cached(memo, `register-dark:${n.key.dark}:${motionKey(offMotion)}:${screen.x},${screen.y},${screen.w},${screen.h}`, () =>
      registerDark({ readDiff, dark: dark.raster, darkScale: n.scale.dark as number, diffSmall: d.diffSmall, darkSmall: n.small.dark as Plane, factor, maxShift, screen }),
    );
    checkMotion('dark', m, W, H, warnings);
    motion.dark = m;
  }
  const spread = cached(memo, `spread:${n.key.on}:${n.key.off}:${motionKey(offMotion)}:${screen.x},${screen.y},${screen.w},${screen.h}`, () => measureEdgeSpread(screen, readDiff, { width: W, height: H }, Math.max(12, 2 * factor)));
  return { motion, screen, screenSource, diffSmall: d.diffSmall, offSmall: d.offSmall, diffSigma: d.sigma, readDiff, spread, mask, warnings };
}
