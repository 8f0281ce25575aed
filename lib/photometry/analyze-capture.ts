import { checkerboardContrast } from './checkerboard';
import { deltaE2000 } from './ciede2000';
import { chromaticity, linearRgbToXyz, xyzToLab, D65_WHITE } from './color';
import { contrastRatio, michelson } from './contrast';
import { luminanceCrop, meanLinearRgb, type LuminanceCrop } from './crop';
import { detectScreen } from './detect-screen';
import { downsampleLuminance } from './downsample';
import { EngineInputError } from './errors';
import { exposureFactor, exposureScales } from './exposure';
import { GHOST_MIN_SNR, searchGhost } from './ghost-search';
import { measureGhost } from './ghost-measure';
import { luminanceHistogram } from './histogram';
import { meterLuminance, METERED_TONE } from './meter';
import { robustSigma } from './percentile';
import { assertRaster, downsampleFactor } from './raster';
import { gridCells, intersectRects, translateRect, unionRects } from './rect';
import { regionMean } from './region-stats';
import { registerPhotos, registerPlanes } from './register';
import type { AnalysisMaps, CaptureResult, EngineWarning, GhostAndUniformity, GhostResult } from './result';
import { scalePlane, shiftPlane, subtractPlanes } from './shift-plane';
import { uniformity } from './uniformity';
import { ENGINE_VERSION } from './version';
import type { ExposureTags, Offset, Pattern, Plane, PhotoRaster, PhotoRole, Rect } from './types';

/** Widest downsampled plane: the maps are made from it, and PRODUCT.md caps them at 1600 px. */
export const MAP_MAX_WIDTH = 1600;
/** Camera movement beyond this share of the width means the photos do not show the same view. */
export const MAX_SHIFT_SHARE = 0.05;

export interface CapturePhoto {
  raster: PhotoRaster;
  exposure?: ExposureTags | null;
  /** Downsampled luminance made by `preparePhoto` (saves a pass when the caller made it early). */
  small?: Plane;
}

export interface CaptureInput {
  on: CapturePhoto;
  off: CapturePhoto;
  ambient?: CapturePhoto | null;
  dark?: CapturePhoto | null;
  pattern?: Pattern;
  /** Regions in the on photo's pixels; a missing screen is detected. */
  screen?: Rect | null;
  background?: Rect | null;
  /** Ghost position minus screen position; 'none' skips the ghost; missing detects it. */
  ghostOffset?: Offset | 'none' | null;
  /** Camera profile factor k, cd/m² per unit of Y·N²/(t·S). */
  calibration?: number | null;
  onProgress?: (stage: string, fraction: number) => void;
}

export interface CaptureAnalysis {
  result: CaptureResult;
  maps: AnalysisMaps;
}

/** The downsampled luminance plane analyzeCapture needs, so decoding callers can make it as each photo arrives. */
export function preparePhoto(raster: PhotoRaster): Plane {
  return downsampleLuminance(raster, downsampleFactor(raster.width, MAP_MAX_WIDTH));
}

function checkRegion(name: string, r: Rect, width: number, height: number): void {
  if (![r.x, r.y, r.w, r.h].every(Number.isFinite)) throw new EngineInputError('bad-argument', `the ${name} region must be four numbers x,y,w,h`);
  if (![r.x, r.y, r.w, r.h].every(Number.isInteger)) throw new EngineInputError('bad-argument', `the ${name} region must be whole pixels`);
  if (r.w < 1 || r.h < 1) throw new EngineInputError('region-empty', `the ${name} region ${r.x},${r.y},${r.w},${r.h} is empty: width and height must be at least 1 px`);
  if (r.x < 0 || r.y < 0 || r.x + r.w > width || r.y + r.h > height) {
    throw new EngineInputError('region-outside', `the ${name} region ${r.x},${r.y},${r.w},${r.h} lies outside the ${width} × ${height} on photo`);
  }
}

function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

const ROLES_AFTER_ON = ['off', 'ambient', 'dark'] as const;

function countClipped(c: LuminanceCrop, r: Rect): { clipped: number; total: number } {
  let clipped = 0;
  let total = 0;
  const { data, width } = c.plane;
  for (let y = r.y; y < r.y + r.h; y++) {
    for (let i = y * width + r.x, end = y * width + r.x + r.w; i < end; i++) {
      const v = data[i] as number;
      if (v !== v) continue;
      total++;
      clipped += c.clipped[i] as number;
    }
  }
  return { clipped, total };
}

/** Analyses one capture set (decoded photos in, reading and map planes out), as PRODUCT.md §5 defines. */
export function analyzeCaptureDetailed(input: CaptureInput): CaptureAnalysis {
  const progress = input.onProgress ?? ((): void => undefined);
  const pattern: Pattern = input.pattern ?? 'full';
  if (pattern !== 'full' && pattern !== 'checkerboard') throw new EngineInputError('bad-argument', `unknown pattern "${String(pattern)}": use full or checkerboard`);
  if (input.calibration !== undefined && input.calibration !== null && !(Number.isFinite(input.calibration) && input.calibration > 0)) {
    throw new EngineInputError('bad-argument', 'the calibration factor must be a positive number');
  }
  const photos: Partial<Record<PhotoRole, CapturePhoto>> = { on: input.on, off: input.off };
  if (input.ambient) photos.ambient = input.ambient;
  if (input.dark) photos.dark = input.dark;
  const on = input.on.raster;
  const { width: W, height: H } = on;
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) {
    assertRaster(p.raster);
    if (p.raster.width !== W || p.raster.height !== H) {
      throw new EngineInputError('size-mismatch', `the ${role} photo is ${p.raster.width} × ${p.raster.height} but the on photo is ${W} × ${H}: use the same camera settings and no cropping`);
    }
  }
  if (input.screen) checkRegion('screen', input.screen, W, H);
  if (input.background) checkRegion('background', input.background, W, H);
  const warnings: EngineWarning[] = [];

  // exposure normalisation onto the on photo's scale (PRODUCT.md §5.3)
  const tags: Partial<Record<PhotoRole, ExposureTags | null>> = {};
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) tags[role] = p.exposure ?? null;
  const exp = exposureScales<PhotoRole>(tags as Record<PhotoRole, ExposureTags | null>, 'on');
  if (!exp.known) {
    warnings.push({ code: 'exposure-unknown', message: `no exposure time, f-number and ISO in the EXIF of: ${exp.missing.join(', ')}; equal exposure assumed` });
  }
  const scaleOf = (role: PhotoRole): number => (exp.scales as Partial<Record<PhotoRole, number>>)[role] ?? 1;

  const factor = downsampleFactor(W, MAP_MAX_WIDTH);
  const small: Partial<Record<PhotoRole, Plane>> = {};
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) {
    const expected = { w: Math.max(1, Math.floor(W / factor)), h: Math.max(1, Math.floor(H / factor)) };
    const given = p.small && p.small.width === expected.w && p.small.height === expected.h ? p.small : preparePhoto(p.raster);
    small[role] = scalePlane(given, scaleOf(role));
  }
  progress('registration', 0.1);

  // registration (PRODUCT.md §5.6)
  const registration: Partial<Record<PhotoRole, Offset>> = { on: { dx: 0, dy: 0 } };
  const maxShift = Math.ceil(2 * MAX_SHIFT_SHARE * W) + 2;
  for (const role of ROLES_AFTER_ON) {
    const p = photos[role];
    if (!p) continue;
    let r: Offset;
    if (role === 'dark') {
      // the dark photo shares the display's light with on − off, not the room
      const o = registration.off as Offset;
      const dOn = subtractPlanes(small.on as Plane, shiftPlane(small.off as Plane, Math.round(o.dx / factor), Math.round(o.dy / factor)));
      const rs = registerPlanes(dOn, small.dark as Plane, Math.ceil(maxShift / factor));
      r = { dx: rs.dx * factor, dy: rs.dy * factor };
    } else {
      r = registerPhotos({
        reference: on,
        moving: p.raster,
        referenceSmall: small.on as Plane,
        movingSmall: small[role] as Plane,
        factor,
        maxShift,
      });
    }
    const d = { dx: r.dx, dy: r.dy };
    const dist = Math.hypot(d.dx, d.dy);
    if (dist > MAX_SHIFT_SHARE * W) {
      throw new EngineInputError('camera-moved', `the camera moved ${dist.toFixed(0)} px between the on and ${role} photos (more than 5% of the width): reshoot from a tripod`);
    }
    if (dist > 1) warnings.push({ code: 'shifted', message: `the ${role} photo is shifted by ${d.dx},${d.dy} px against the on photo; aligned` });
    registration[role] = d;
  }
  progress('regions', 0.35);

  const alignedSmall = (role: PhotoRole): Plane => {
    const d = registration[role] as Offset;
    return shiftPlane(small[role] as Plane, Math.round(d.dx / factor), Math.round(d.dy / factor));
  };
  const offSmall = alignedSmall('off');
  const diffSmall = subtractPlanes(small.on as Plane, offSmall);
  const sampleSigma = (p: Plane): number => {
    const step = Math.max(1, Math.floor(p.data.length / 200_000));
    const s: number[] = [];
    for (let i = 0; i < p.data.length; i += step) s.push(p.data[i] as number);
    return robustSigma(s);
  };

  // screen: marked, or detected from D (PRODUCT.md §5.7)
  let screen: Rect;
  let screenSource: 'marked' | 'detected';
  if (input.screen) {
    screen = { ...input.screen };
    screenSource = 'marked';
  } else {
    const found = detectScreen(diffSmall, sampleSigma(diffSmall));
    if (!found) throw new EngineInputError('no-screen-found', 'no display light found between the on and off photos: check the display was on, or mark the screen region');
    const x0 = found.x * factor;
    const y0 = found.y * factor;
    const x1 = Math.min(W, (found.x + found.w) * factor);
    const y1 = Math.min(H, (found.y + found.h) * factor);
    screen = { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
    screenSource = 'detected';
  }
  if (pattern === 'checkerboard' && (screen.w < 8 || screen.h < 8)) {
    throw new EngineInputError('region-too-small', `the screen ${screen.w} × ${screen.h} px is too small for a 4 × 4 checkerboard: at least 8 × 8 px`);
  }
  const background = input.background ? { ...input.background } : null;

  // ghost offsets: marked, skipped, or searched on the downsampled difference
  const screenSmall = (): Rect => {
    const x0 = Math.ceil(screen.x / factor);
    const y0 = Math.ceil(screen.y / factor);
    const x1 = Math.max(x0 + 1, Math.floor((screen.x + screen.w) / factor));
    const y1 = Math.max(y0 + 1, Math.floor((screen.y + screen.h) / factor));
    return { x: x0, y: y0, w: Math.min(diffSmall.width, x1) - x0, h: Math.min(diffSmall.height, y1) - y0 };
  };
  type Found = { offset: Offset; source: 'marked' | 'detected'; snr: number | null } | null;
  const findGhost = (d: Plane): Found => {
    if (input.ghostOffset === 'none') return null;
    if (input.ghostOffset) return { offset: { ...input.ghostOffset }, source: 'marked', snr: null };
    const ss = screenSmall();
    if (ss.w < 1 || ss.h < 1) return null;
    const c = searchGhost(d, ss, 2 / factor);
    if (!c || c.snr < GHOST_MIN_SNR || c.gain <= 0) return null;
    const offset = factor === 1 ? { dx: Math.round(c.dx), dy: Math.round(c.dy) } : { dx: Math.round(c.dx * factor), dy: Math.round(c.dy * factor) };
    if (Math.hypot(offset.dx, offset.dy) < 2) return null;
    return { offset, source: 'detected', snr: c.snr };
  };
  if (input.ghostOffset && input.ghostOffset !== 'none') {
    const o = input.ghostOffset;
    if (!Number.isInteger(o.dx) || !Number.isInteger(o.dy) || (o.dx === 0 && o.dy === 0)) {
      throw new EngineInputError('bad-argument', 'the ghost offset must be whole pixels dx,dy, not 0,0');
    }
    if (!intersectRects(translateRect(screen, o.dx, o.dy), { x: 0, y: 0, w: W, h: H })) {
      throw new EngineInputError('region-outside', `the ghost offset ${o.dx},${o.dy} moves the screen outside the image`);
    }
  }
  progress('ghost', 0.5);
  const ghostOnOff = findGhost(diffSmall);
  const darkSmall = photos.dark ? alignedSmall('dark') : null;
  const ghostDark = darkSmall ? findGhost(darkSmall) : null;

  // full-resolution crops over everything measured, aligned and exposure-normalised
  const imageRect: Rect = { x: 0, y: 0, w: W, h: H };
  const needed: Rect[] = [screen];
  if (background) needed.push(background);
  for (const g of [ghostOnOff, ghostDark]) {
    if (!g) continue;
    for (const k of [1, -1, -2]) {
      const r = intersectRects(translateRect(screen, k * g.offset.dx, k * g.offset.dy), imageRect);
      if (r) needed.push(r);
    }
  }
  const cropRect = unionRects(needed);
  progress('measure', 0.6);
  const crops: Partial<Record<PhotoRole, LuminanceCrop>> = {};
  for (const [role, p] of Object.entries(photos) as [PhotoRole, CapturePhoto][]) {
    crops[role] = luminanceCrop(p.raster, cropRect, registration[role] as Offset, scaleOf(role));
  }
  progress('crops', 0.65);
  const local = (r: Rect): Rect => translateRect(r, -cropRect.x, -cropRect.y);
  const meanOver = (role: PhotoRole, r: Rect): number => regionMean((crops[role] as LuminanceCrop).plane, local(r));
  const cropOn = crops.on as LuminanceCrop;
  const cropOff = crops.off as LuminanceCrop;

  const lOn = meanOver('on', screen);
  const lOff = meanOver('off', screen);
  const lAmb = photos.ambient ? meanOver('ambient', screen) : Number.NaN;
  const lDark = photos.dark ? meanOver('dark', screen) : Number.NaN;
  const acr = lOff > 0 ? contrastRatio(lOn, lOff) : Number.NaN;

  const screenSigma = sampleSigma(diffSmall);
  if (!(lOn - lOff > 3 * screenSigma / Math.sqrt(Math.max(1, (screen.w * screen.h) / (factor * factor))))) {
    warnings.push({ code: 'low-signal', message: 'the screen is barely brighter in the on photo than in the off photo: check the display and the screen region' });
  }

  let mich: number | null = null;
  let ansi: number | null = null;
  let checker: CaptureResult['checkerboard'] = null;
  if (pattern === 'full') {
    mich = finiteOrNull(michelson(lOn, lOff));
  } else {
    // ANSI/IEC checkerboard: each cell over its central 50% × 50%
    const cells = gridCells(screen, 4, 4, 0.5).map((c) => meanOver('on', c));
    const cb = checkerboardContrast(cells);
    ansi = finiteOrNull(cb.ansiContrast);
    mich = finiteOrNull(cb.michelson);
    checker = { white: cb.white, black: cb.black, whiteParity: cb.whiteParity, separation: finiteOrNull(cb.separation) ?? 0 };
    if (!(cb.separation > 1.2)) warnings.push({ code: 'checkerboard-unclear', message: 'the white and black cells overlap in level: check the pattern is a 4 × 4 checkerboard filling the screen region' });
  }

  const ghostAndUniformity = (d: Plane, minus: Plane | undefined, found: Found): GhostAndUniformity => {
    let ghost: GhostResult | null = null;
    if (found) {
      const m = measureGhost(d, { x: cropRect.x, y: cropRect.y }, screen, found.offset, minus);
      if (m && Number.isFinite(m.ratio)) {
        ghost = { ratio: m.ratio, dx: found.offset.dx, dy: found.offset.dy, source: found.source, firstOrder: m.firstOrder, snr: found.snr };
      }
    }
    let u: number | null = null;
    let cells: number[] | null = null;
    if (pattern === 'full' && screen.w >= 3 && screen.h >= 3) {
      cells = gridCells(screen, 3, 3).map((c) => regionMean(d, local(c)) - (minus ? regionMean(minus, local(c)) : 0));
      if (cells.every(Number.isFinite)) u = finiteOrNull(uniformity(cells).minOverMax);
      else cells = null;
    }
    return { ghost, uniformity: u, uniformityCells: cells };
  };
  progress('ghost-ratio', 0.68);
  const onMinusOff = ghostAndUniformity(cropOn.plane, cropOff.plane, ghostOnOff);
  const darkVariant = photos.dark ? ghostAndUniformity((crops.dark as LuminanceCrop).plane, undefined, ghostDark) : null;
  const primary = darkVariant ?? onMinusOff;

  progress('see-through', 0.7);
  // transmission and tint over the background, or the screen when none is marked
  let transmission: number | null = null;
  let tint: CaptureResult['tint'] = null;
  const seeThrough = background ?? screen;
  if (photos.ambient) {
    if (!background) warnings.push({ code: 'transmission-over-screen', message: 'no background region marked: transmission and tint are measured over the screen' });
    const tOff = meanOver('off', seeThrough);
    const tAmb = meanOver('ambient', seeThrough);
    transmission = tAmb > 0 ? finiteOrNull(tOff / tAmb) : null;
    const rgbOff = meanLinearRgb(input.off.raster, seeThrough, registration.off as Offset);
    const rgbAmb = meanLinearRgb(photos.ambient.raster, seeThrough, registration.ambient as Offset);
    const xyzOff = linearRgbToXyz(rgbOff.r * scaleOf('off'), rgbOff.g * scaleOf('off'), rgbOff.b * scaleOf('off'));
    const xyzAmb = linearRgbToXyz(rgbAmb.r * scaleOf('ambient'), rgbAmb.g * scaleOf('ambient'), rgbAmb.b * scaleOf('ambient'));
    if (xyzOff.y > 0 && xyzAmb.y > 0) {
      const cOff = chromaticity(xyzOff);
      const cAmb = chromaticity(xyzAmb);
      // equal luminance, placed at mid-grey (Y/Yn = 0.18), where CIEDE2000's lightness weighting is neutral
      const k = xyzAmb.y / xyzOff.y;
      const white = { x: (D65_WHITE.x * xyzAmb.y) / 0.18, y: xyzAmb.y / 0.18, z: (D65_WHITE.z * xyzAmb.y) / 0.18 };
      const labOff = xyzToLab({ x: xyzOff.x * k, y: xyzOff.y * k, z: xyzOff.z * k }, white);
      const labAmb = xyzToLab(xyzAmb, white);
      tint = { dx: cOff.x - cAmb.x, dy: cOff.y - cAmb.y, deltaE00: deltaE2000(labOff, labAmb), off: cOff, ambient: cAmb };
    }
  }

  progress('clipping', 0.75);
  // clipping inside the analysed regions (PRODUCT.md §5.5)
  const analysed = background ? [screen, background] : [screen];
  const clippedByPhoto: Partial<Record<PhotoRole, number>> = {};
  let clippedFraction = 0;
  const overlap = background ? intersectRects(screen, background) : null;
  for (const [role, c] of Object.entries(crops) as [PhotoRole, LuminanceCrop][]) {
    let clipped = 0;
    let total = 0;
    // union of the regions = sum of each minus their overlap
    for (const [r, sign] of [...analysed.map((a) => [a, 1] as const), ...(overlap ? [[overlap, -1] as const] : [])]) {
      const counted = countClipped(c, local(r));
      clipped += sign * counted.clipped;
      total += sign * counted.total;
    }
    const f = total > 0 ? clipped / total : 0;
    clippedByPhoto[role] = f;
    clippedFraction = Math.max(clippedFraction, f);
  }
  if (clippedFraction > 0.001) {
    const worst = (Object.entries(clippedByPhoto) as [PhotoRole, number][]).filter(([, f]) => f > 0.001).map(([r, f]) => `${r} ${(100 * f).toFixed(2)}%`);
    warnings.push({ code: 'clipped', message: `clipped pixels in the analysed regions (${worst.join(', ')}): contrast is underestimated; lower the exposure or bracket` });
  }
  for (const [name, v] of [['on − off', onMinusOff], ['dark', darkVariant]] as const) {
    if (v?.ghost && v.ghost.ratio > 0 && clippedByPhoto.on !== undefined && clippedByPhoto.on > 0.001) {
      warnings.push({ code: 'ghost-band-clipped', message: `the ${name} ghost ratio is measured against a clipped screen and reads too high` });
      break;
    }
  }

  // absolute luminance: a camera profile, or the meter equation as a labelled rough estimate
  let absoluteLuminance: CaptureResult['absoluteLuminance'] = null;
  const eOn = exposureFactor(input.on.exposure);
  const onTags = input.on.exposure;
  if (input.calibration) {
    if (eOn === null) warnings.push({ code: 'calibration-needs-exposure', message: 'the on photo has no exposure EXIF, so the calibration factor cannot convert to cd/m²' });
    else {
      // camera profile: L = k·Y·N²/(t·S)
      const k = input.calibration / eOn;
      absoluteLuminance = { kind: 'calibrated', on: k * lOn, off: k * lOff, ambient: finiteOrNull(k * lAmb) };
    }
  } else if (eOn !== null && onTags?.exposureTime && onTags.fNumber && onTags.iso) {
    const k = meterLuminance(onTags.exposureTime, onTags.fNumber, onTags.iso) / METERED_TONE;
    absoluteLuminance = { kind: 'rough-estimate', on: k * lOn, off: k * lOff, ambient: finiteOrNull(k * lAmb) };
  }

  progress('maps', 0.85);
  const logContrast = new Float32Array(diffSmall.data.length);
  const onS = (small.on as Plane).data;
  for (let i = 0; i < logContrast.length; i++) {
    const a = onS[i] as number;
    const b = offSmall.data[i] as number;
    logContrast[i] = a > 0 && b > 0 ? Math.log10(a / b) : Number.NaN;
  }
  const histograms: AnalysisMaps['histograms'] = {};
  for (const [role, p] of Object.entries(small) as [PhotoRole, Plane][]) histograms[role] = luminanceHistogram(p.data, 96, -14, 2, Math.max(1, Math.floor(p.data.length / 250_000)));

  const result: CaptureResult = {
    engineVersion: ENGINE_VERSION,
    image: { width: W, height: H },
    pattern,
    registration: {
      off: registration.off as Offset,
      ambient: registration.ambient ?? null,
      dark: registration.dark ?? null,
    },
    screen: { ...screen, source: screenSource },
    background,
    luminance: { on: lOn, off: lOff, ambient: finiteOrNull(lAmb), dark: finiteOrNull(lDark) },
    absoluteLuminance,
    ambientContrastRatio: finiteOrNull(acr),
    michelson: mich,
    ansiContrast: ansi,
    checkerboard: checker,
    uniformity: primary.uniformity,
    uniformityCells: primary.uniformityCells,
    ghost: primary.ghost,
    variants: { onMinusOff, dark: darkVariant },
    transmission,
    tint,
    clippedFraction,
    clippedByPhoto,
    exposure: { known: exp.known, scales: exp.scales },
    warnings,
  };
  progress('done', 1);
  return {
    result,
    maps: { factor, logContrast: { data: logContrast, width: diffSmall.width, height: diffSmall.height }, difference: diffSmall, histograms },
  };
}

/** Analyses one capture set and returns the reading only. */
export function analyzeCapture(input: CaptureInput): CaptureResult {
  return analyzeCaptureDetailed(input).result;
}
