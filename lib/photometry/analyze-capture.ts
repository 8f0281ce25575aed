import type { BracketSummary } from './bracket-merge';
import { EngineInputError } from './errors';
import { scaleMotion, translation, type Motion } from './motion';
import { checkBothClipped, checkDisplayLight, checkTransmission, checkUniformityCells, displayLightError } from './plausibility';
import { intersectRects, translateRect } from './rect';
import type { AlignmentDetail, AnalysisMaps, CaptureResult, EngineWarning, GhostAndUniformity } from './result';
import { diffReader } from './screen-edges';
import { alignAndLocate, sourceOf, type Aligned } from './stages/align';
import { analysisMaps } from './stages/artifacts';
import { findGhost } from './stages/ghost';
import { cached, type AnalysisMemo } from './stages/memo';
import { absoluteLuminance, clipping, contrastFigures, finiteOrNull, measureRegions, regionsOf, seeThrough, seeThroughMeans, uniformityCells, type RegionTotals } from './stages/measure';
import { fitExclusions, seeThroughFit } from './stages/see-through-fit';
import { uncertainties } from './stages/uncertainty';
import { registrationBound } from './uncertainty';
import { normalise, type CaptureRoleInput, type Normalised } from './stages/normalise';
import { checkOpticsOptions, opticsReadings, type OpticsOptions } from './stages/optics';
import { readOrientation } from './stages/orientation';
import { uniformity } from './uniformity';
import { ENGINE_VERSION } from './version';
import { warpPlane } from './warp';
import type { Offset, Pattern, Plane, PhotoRole, Rect } from './types';

export { MAP_MAX_WIDTH, preparePhoto, resolveRolePhoto, type CapturePhoto, type CaptureRoleInput } from './stages/normalise';
export { MAX_SHIFT_SHARE } from './stages/align';
export type { AnalysisMemo } from './stages/memo';

export interface CaptureInput {
  on: CaptureRoleInput;
  off: CaptureRoleInput;
  ambient?: CaptureRoleInput | null;
  dark?: CaptureRoleInput | null;
  pattern?: Pattern;
  /** Regions in the on photo's pixels; a missing screen is detected. */
  screen?: Rect | null;
  background?: Rect | null;
  /** Ghost position minus screen position; 'none' skips the ghost; missing detects it. */
  ghostOffset?: Offset | 'none' | null;
  /** Camera profile factor k, cd/m² per unit of Y·N²/(t·S). */
  calibration?: number | null;
  onProgress?: (stage: string, fraction: number) => void;
  /**
   * Results of pure steps kept by a previous call on some of the same photos (see `AnalysisMemo`):
   * each is keyed by everything it depends on, so a hit returns what the step would compute.
   */
  memo?: AnalysisMemo | null;
  /**
   * The caller will run again with an ambient photo and the same memo (see `AnalysisMemo`): the off
   * photo's pass then also sums the colour the see-through measurement needs, sparing a second
   * pass over it.
   */
  ambientFollows?: boolean;
  /** Camera profile's degrees per pixel and the stack's display resolution and white (field of view, pixels per degree, Δu′v′). */
  optics?: OpticsOptions | null;
}

/** A reading whose roles were bracketed carries how each bracket was merged. */
export type BracketedResult = CaptureResult & { brackets?: Partial<Record<PhotoRole, BracketSummary>> };

export interface CaptureAnalysis {
  result: BracketedResult;
  maps: AnalysisMaps;
}

const round1 = (v: number): number => Math.round(v * 10) / 10;

/** The marked ghost offset checked against the screen and the image. */
function checkGhostOffset(o: Offset | 'none' | null | undefined, screen: Rect, width: number, height: number): void {
  if (!o || o === 'none') return;
  if (!Number.isInteger(o.dx) || !Number.isInteger(o.dy) || (o.dx === 0 && o.dy === 0)) {
    throw new EngineInputError('bad-argument', 'the ghost offset must be whole pixels dx,dy, not 0,0');
  }
  if (!intersectRects(translateRect(screen, o.dx, o.dy), { x: 0, y: 0, w: width, h: height })) {
    throw new EngineInputError('region-outside', `the ghost offset ${o.dx},${o.dy} moves the screen outside the image`);
  }
}

/** Ghost and uniformity of the on − off variant and, with a dark photo, of the dark variant. */
export function ghostVariants(n: Normalised, a: Aligned, totals: RegionTotals, marked: Offset | 'none' | null, memo: AnalysisMemo | null, warnings: EngineWarning[]): { onMinusOff: GhostAndUniformity; dark: GhostAndUniformity | null; darkPlane: Plane | null } {
  const common = { screen: a.screen, factor: n.factor, width: n.width, height: n.height, zone: a.spread.zone, marked };
  const off = a.motion.off as Motion;
  const diffKey = `${n.key.on}:${n.key.off}:${off.dx},${off.dy},${off.angle}`;
  const variant = (roles: readonly PhotoRole[], plane: Plane, read: (r: Rect) => Float32Array, key: string | null, name: string): GhostAndUniformity => {
    const background = key ? cached(memo, `far:${key}`, () => meanOutside(plane, a.mask, n.factor)) : meanOutside(plane, a.mask, n.factor);
    const ghost = findGhost({ ...common, plane, read, key, background }, memo);
    let cells = uniformityCells(totals, roles);
    let u: number | null = null;
    if (!checkUniformityCells(cells, name, warnings)) cells = null;
    else if (cells) u = finiteOrNull(uniformity(cells).minOverMax);
    return { ghost, uniformity: u, uniformityCells: cells };
  };
  const onMinusOff = variant(['on', 'off'], a.diffSmall, a.readDiff, diffKey, 'on − off');
  let dark: GhostAndUniformity | null = null;
  let darkPlane: Plane | null = null;
  if (n.photos.dark) {
    const m = a.motion.dark as Motion;
    const darkSmall = warpPlane(n.small.dark as Plane, scaleMotion(m, n.factor));
    // the room light left in the dark photo, as a share of the off photo's (see darkRoomShare)
    const k = darkRoomShare(darkSmall, a.offSmall, a.mask, n.factor);
    const plane = k > 0 ? subtractScaled(darkSmall, a.offSmall, k) : darkSmall;
    const offSrc = sourceOf(n, 'off', off);
    const read = k > 0 ? diffReader(sourceOf(n, 'dark', m), { ...offSrc, scale: offSrc.scale * k }) : diffReader(sourceOf(n, 'dark', m));
    dark = variant(['dark'], plane, read, null, 'dark');
    darkPlane = plane;
  }
  return { onMinusOff, dark, darkPlane };
}

/**
 * The room light left in the dark photo (a lamp, a window) as a share k of the off photo's, by least
 * squares through the origin over the frame outside the display's light. The ghost is then measured
 * on dark − k·off, where the room drops out as it does from on − off; 0 when the dark photo holds
 * no room light to speak of.
 */
export function darkRoomShare(dark: Plane, off: Plane, mask: readonly Rect[], factor: number): number {
  const { width: w, height: h } = dark;
  const inMask = masked(mask, factor);
  let sdo = 0;
  let soo = 0;
  let n = 0;
  const step = Math.max(1, Math.floor(Math.sqrt((w * h) / 100_000)));
  for (let y = 0; y < h; y += step) {
    for (let x = 0; x < w; x += step) {
      if (inMask(x, y)) continue;
      const d = dark.data[y * w + x] as number;
      const o = off.data[y * w + x] as number;
      if (d !== d || o !== o) continue;
      sdo += d * o;
      soo += o * o;
      n++;
    }
  }
  if (n < 100 || !(soo > 0)) return 0;
  const k = sdo / soo;
  return k > 1e-4 ? k : 0;
}

/** Whether block (x, y) of a plane downsampled by `factor` touches one of the rectangles. */
function masked(mask: readonly Rect[], factor: number): (x: number, y: number) => boolean {
  return (x, y) => mask.some((r) => x * factor + factor > r.x && x * factor < r.x + r.w && y * factor + factor > r.y && y * factor < r.y + r.h);
}

/** Mean of a small plane outside the display's mask (the frame far from the display), or null when too little is left. */
export function meanOutside(p: Plane, mask: readonly Rect[], factor: number): number | null {
  const inMask = masked(mask, factor);
  const { width: w, height: h } = p;
  const step = Math.max(1, Math.floor(Math.sqrt((w * h) / 100_000)));
  let s = 0;
  let n = 0;
  for (let y = 0; y < h; y += step) {
    for (let x = 0; x < w; x += step) {
      if (inMask(x, y)) continue;
      const v = p.data[y * w + x] as number;
      if (v === v) { s += v; n++; }
    }
  }
  return n >= 100 ? s / n : null;
}

function subtractScaled(a: Plane, b: Plane, k: number): Plane {
  const out = new Float32Array(a.data.length);
  for (let i = 0; i < out.length; i++) out[i] = (a.data[i] as number) - k * (b.data[i] as number);
  return { data: out, width: a.width, height: a.height };
}

function detail(m: Aligned['motion'][PhotoRole]): AlignmentDetail | undefined {
  if (!m) return undefined;
  return {
    dx: round1(m.dx),
    dy: round1(m.dy),
    rotationDeg: Math.round((m.angle * 180 * 100) / Math.PI) / 100,
    peakRatio: m.runnerUp > 0 ? m.peak / m.runnerUp : Number.POSITIVE_INFINITY,
    windows: m.windows,
    spread: round1(m.spread),
    residual: Number.isFinite(m.residual) ? Math.round(m.residual * 1000) / 1000 : null,
  };
}

/**
 * Analyses one capture set (decoded photos in, reading and map planes out), as docs/method.md §5
 * defines, in stages that pass their results on as values: normalise (check, merge brackets,
 * exposure, small planes), align and locate (registration with the display masked, the screen,
 * its edge spread), measure (one pass per photo over its rectangles), the plausibility guards,
 * the ghost, and the maps.
 */
export function analyzeCaptureDetailed(input: CaptureInput): CaptureAnalysis {
  const progress = input.onProgress ?? ((): void => undefined);
  const memo = input.memo ?? null;
  const pattern: Pattern = input.pattern ?? 'full';
  checkOpticsOptions(input.optics ?? {});
  const n = normalise(input, memo);
  const warnings: EngineWarning[] = [...n.warnings];
  progress('registration', 0.1);
  const a = alignAndLocate(n, { screen: input.screen ?? null, ghostOffset: input.ghostOffset ?? null }, memo);
  warnings.push(...a.warnings);
  const { screen } = a;
  progress('regions', 0.35);
  if (pattern === 'checkerboard' && (screen.w < 8 || screen.h < 8)) {
    throw new EngineInputError('region-too-small', `the screen ${screen.w} × ${screen.h} px is too small for a 4 × 4 checkerboard: at least 8 × 8 px`);
  }
  checkGhostOffset(input.ghostOffset, screen, n.width, n.height);
  const background = input.background ? { ...input.background } : null;

  progress('measure', 0.5);
  const motions: Partial<Record<PhotoRole, Motion>> = { ...a.motion };
  const regions = regionsOf(screen, background, pattern);
  const totals = measureRegions(n, motions, regions, { ambientFollows: input.ambientFollows ?? false }, memo);
  const levels = contrastFigures(n, totals, pattern, warnings);
  // a detected screen with no light cannot be (detection needs it); a marked one is kept and flagged
  checkDisplayLight(levels.lOn, levels.lOff, displayLightError(a.diffSigma, screen, n.factor), warnings, a.screenSource === 'detected');

  progress('ghost', 0.6);
  const marked = input.ghostOffset === 'none' ? 'none' : input.ghostOffset ?? null;
  const { onMinusOff, dark: darkVariant, darkPlane } = ghostVariants(n, a, totals, marked, memo, warnings);
  const primary = darkVariant ?? onMinusOff;

  progress('see-through', 0.7);
  const { transmission, tint } = seeThrough(n, totals, warnings, background !== null);
  checkTransmission(transmission, background !== null, warnings);

  progress('clipping', 0.75);
  const clip = clipping(n, totals);
  if (clip.worst > 0.001) {
    const worst = (Object.entries(clip.byPhoto) as [PhotoRole, number][]).filter(([, f]) => f > 0.001).map(([r, f]) => `${r} ${(100 * f).toFixed(2)}%`);
    warnings.push({ code: 'clipped', message: `clipped pixels in the analysed regions (${worst.join(', ')}): contrast is underestimated; lower the exposure or bracket` });
  }
  checkBothClipped(clip.byPhoto, warnings);
  for (const [name, v] of [['on − off', onMinusOff], ['dark', darkVariant]] as const) {
    if (v?.ghost && v.ghost.ratio > 0 && clip.byPhoto.on !== undefined && clip.byPhoto.on > 0.001) {
      warnings.push({ code: 'ghost-band-clipped', message: `the ${name} ghost ratio is measured against a clipped screen and reads too high` });
      break;
    }
  }
  const absolute = absoluteLuminance(n, levels, input.calibration, warnings);

  progress('see-through fit', 0.8);
  // cd/m² per unit of on-scale luminance, from a camera profile only
  const cdm2PerUnit = absolute?.kind === 'calibrated' && levels.lOn > 0 ? absolute.on / levels.lOn : null;
  const fit = n.photos.ambient
    ? seeThroughFit(
        n,
        { off: a.motion.off as Motion, ambient: a.motion.ambient as Motion },
        { background, exclude: fitExclusions(a.mask, screen, a.spread.zone, primary.ghost ?? onMinusOff.ghost) },
        cdm2PerUnit,
        warnings,
        Math.hypot(registrationBound(a.motion.off?.spread), registrationBound(a.motion.ambient?.spread)),
      )
    : { transmissionOptics: null, veil: null, u: null, noise: null };
  progress('uncertainty', 0.81);
  const uncertainty = uncertainties({
    n,
    a,
    regions,
    levels,
    pattern,
    primary,
    primaryPlane: darkVariant && darkPlane ? { plane: darkPlane, dark: true } : { plane: a.diffSmall, dark: false },
    transmission,
    seeThroughMeans: seeThroughMeans(n, totals),
    fit,
  });
  progress('sharpness, geometry, colour', 0.82);

  const optics = opticsReadings(n, a, pattern, input.optics ?? {}, warnings, (darkSmall) => darkRoomShare(darkSmall, a.offSmall, a.mask, n.factor), memo);
  const orientation = readOrientation(n, a, pattern, warnings);

  progress('maps', 0.85);
  const off = a.motion.off as Motion;
  const maps = analysisMaps(n, a.diffSmall, a.offSmall, `${n.key.on}:${n.key.off}:${off.dx},${off.dy},${off.angle}`, memo);

  const reg = (role: PhotoRole): Offset | null => {
    const m = a.motion[role];
    return m ? { dx: round1(m.dx), dy: round1(m.dy) } : null;
  };
  const alignment: NonNullable<CaptureResult['alignment']> = {};
  for (const role of ['off', 'ambient', 'dark'] as const) {
    const d = detail(a.motion[role]);
    if (d) alignment[role] = d;
  }
  const result: BracketedResult = {
    engineVersion: ENGINE_VERSION,
    image: { width: n.width, height: n.height },
    pattern,
    registration: { off: reg('off') as Offset, ambient: reg('ambient'), dark: reg('dark') },
    screen: { ...screen, source: a.screenSource },
    background,
    luminance: { on: levels.lOn, off: levels.lOff, ambient: finiteOrNull(levels.lAmb), dark: finiteOrNull(levels.lDark) },
    absoluteLuminance: absolute,
    ambientContrastRatio: levels.acr,
    michelson: levels.michelson,
    ansiContrast: levels.ansi,
    checkerboard: levels.checker,
    uniformity: primary.uniformity,
    uniformityCells: primary.uniformityCells,
    ghost: primary.ghost,
    variants: { onMinusOff, dark: darkVariant },
    transmission,
    tint,
    clippedFraction: clip.worst,
    clippedByPhoto: clip.byPhoto,
    exposure: n.exposure,
    warnings,
    alignment,
    edge: { spread: round1(a.spread.width), zone: a.spread.zone },
    transmissionOptics: fit.transmissionOptics,
    veil: fit.veil,
    uncertainty,
    sharpness: optics.sharpness,
    geometry: optics.geometry,
    displayColour: optics.displayColour,
    ...(pattern === 'orientation' ? { orientation } : {}),
  };
  const brackets: Partial<Record<PhotoRole, BracketSummary>> = {};
  for (const role of n.roles) {
    const b = n.photos[role]?.bracket;
    if (b) brackets[role] = b;
  }
  // the key appears only for bracketed input, so single-photo readings keep their exact shape
  if (Object.keys(brackets).length > 0) result.brackets = brackets;
  progress('done', 1);
  return { result, maps };
}

/** Analyses one capture set and returns the reading only. */
export function analyzeCapture(input: CaptureInput): BracketedResult {
  return analyzeCaptureDetailed(input).result;
}

/** A whole-pixel translation as a motion (for callers holding old integer registrations). */
export function motionOf(o: Offset, width: number, height: number): Motion {
  return translation(o, width, height);
}
