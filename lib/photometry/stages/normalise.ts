import { mergeBracket, type BracketSummary } from '../bracket-merge';
import { downsampleLuminance } from '../downsample';
import { EngineInputError } from '../errors';
import { exposureScales } from '../exposure';
import { assertRaster, downsampleFactor } from '../raster';
import type { EngineWarning } from '../result';
import { scalePlane } from '../shift-plane';
import type { ExposureTags, Pattern, Plane, PhotoRaster, PhotoRole, Rect } from '../types';
import { cached, idOf, type AnalysisMemo } from './memo';

/** Widest downsampled plane: the maps are made from it, and docs/method.md §5.9 caps them at 1600 px. */
export const MAP_MAX_WIDTH = 800;

export interface CapturePhoto {
  raster: PhotoRaster;
  exposure?: ExposureTags | null;
  /** Downsampled luminance made by `preparePhoto` (saves a pass when the caller made it early). */
  small?: Plane;
  /** Multiplier from the raster's luminance to the photo's own exposure scale (a merged bracket's; 1 otherwise). */
  gain?: number;
  /** Set on a merged bracket: how it was merged, reported in the reading. */
  bracket?: BracketSummary;
  /**
   * Set by a decoder that met a file with several pages or frames (a multi-page TIFF): how many it
   * holds and which one (0-based) the raster is. The reading then says which page was measured.
   */
  pages?: { count: number; measured: number } | null;
}

/** A role's photo, or several photos of it at different exposures (a bracket). */
export type CaptureRoleInput = CapturePhoto | readonly CapturePhoto[];

/** The downsampled luminance plane the analysis needs, so decoding callers can make it as each photo arrives. */
export function preparePhoto(raster: PhotoRaster): Plane {
  return downsampleLuminance(raster, downsampleFactor(raster.width, MAP_MAX_WIDTH));
}

/**
 * One photo standing for a role: a single photo as given, a bracket merged into one linear
 * 16-bit plane on its first member's exposure (see `mergeBracket`).
 */
export function resolveRolePhoto(input: CaptureRoleInput, role: PhotoRole): CapturePhoto {
  if (!Array.isArray(input)) return input as CapturePhoto;
  const list = input as readonly CapturePhoto[];
  if (list.length === 0) throw new EngineInputError('file-missing', `the ${role} bracket holds no photo`);
  if (list.length === 1) return list[0] as CapturePhoto;
  try {
    const m = mergeBracket(list.map((p) => ({ raster: p.raster, exposure: p.exposure ?? null })));
    return { raster: m.raster, exposure: m.exposure, gain: m.gain, bracket: m.summary };
  } catch (e) {
    if (e instanceof RangeError) throw new EngineInputError(/size/.test(e.message) ? 'size-mismatch' : 'bad-argument', `the ${role} bracket: ${e.message}`);
    throw e;
  }
}

/** The photos of a capture checked, exposure-normalised and downsampled: the first stage's result. */
export interface Normalised {
  photos: Partial<Record<PhotoRole, CapturePhoto>>;
  roles: PhotoRole[];
  width: number;
  height: number;
  /** Multiplier bringing each photo's luminance onto the on photo's exposure (docs/method.md §5.3). */
  scale: Partial<Record<PhotoRole, number>>;
  exposure: { known: boolean; scales: Partial<Record<PhotoRole, number>> };
  /** Downsampling factor of the small planes. */
  factor: number;
  /** Each photo's downsampled luminance on the on photo's scale. */
  small: Partial<Record<PhotoRole, Plane>>;
  /** Identity of each small plane (raster, plane, scale), for memo keys. */
  key: Partial<Record<PhotoRole, string>>;
  warnings: EngineWarning[];
}

function checkRegion(name: string, r: Rect, width: number, height: number): void {
  if (![r.x, r.y, r.w, r.h].every(Number.isFinite)) throw new EngineInputError('bad-argument', `the ${name} region must be four numbers x,y,w,h`);
  if (![r.x, r.y, r.w, r.h].every(Number.isInteger)) throw new EngineInputError('bad-argument', `the ${name} region must be whole pixels`);
  if (r.w < 1 || r.h < 1) throw new EngineInputError('region-empty', `the ${name} region ${r.x},${r.y},${r.w},${r.h} is empty: width and height must be at least 1 px`);
  if (r.x < 0 || r.y < 0 || r.x + r.w > width || r.y + r.h > height) {
    throw new EngineInputError('region-outside', `the ${name} region ${r.x},${r.y},${r.w},${r.h} lies outside the ${width} × ${height} on photo`);
  }
}

/** Checks the input's photos and regions, merges brackets, normalises exposure and makes the small planes. */
export function normalise(
  input: { on: CaptureRoleInput; off: CaptureRoleInput; ambient?: CaptureRoleInput | null; dark?: CaptureRoleInput | null; pattern?: Pattern; screen?: Rect | null; background?: Rect | null; calibration?: number | null },
  memo: AnalysisMemo | null,
): Normalised {
  const pattern = input.pattern ?? 'full';
  if (pattern !== 'full' && pattern !== 'checkerboard' && pattern !== 'slanted-edge' && pattern !== 'orientation') throw new EngineInputError('bad-argument', `unknown pattern "${String(pattern)}": use full, checkerboard, slanted-edge or orientation`);
  if (input.calibration !== undefined && input.calibration !== null && !(Number.isFinite(input.calibration) && input.calibration > 0)) {
    throw new EngineInputError('bad-argument', 'the calibration factor must be a positive number');
  }
  const photos: Partial<Record<PhotoRole, CapturePhoto>> = { on: resolveRolePhoto(input.on, 'on'), off: resolveRolePhoto(input.off, 'off') };
  if (input.ambient) photos.ambient = resolveRolePhoto(input.ambient, 'ambient');
  if (input.dark) photos.dark = resolveRolePhoto(input.dark, 'dark');
  const roles = Object.keys(photos) as PhotoRole[];
  const on = (photos.on as CapturePhoto).raster;
  const { width: W, height: H } = on;
  for (const role of roles) {
    const p = photos[role] as CapturePhoto;
    assertRaster(p.raster);
    if (p.raster.width !== W || p.raster.height !== H) {
      throw new EngineInputError('size-mismatch', `the ${role} photo is ${p.raster.width} × ${p.raster.height} but the on photo is ${W} × ${H}: use the same camera settings and no cropping`);
    }
  }
  if (input.screen) checkRegion('screen', input.screen, W, H);
  if (input.background) checkRegion('background', input.background, W, H);
  const warnings: EngineWarning[] = [];

  const tags: Partial<Record<PhotoRole, ExposureTags | null>> = {};
  for (const role of roles) tags[role] = photos[role]?.exposure ?? null;
  const exp = exposureScales<PhotoRole>(tags as Record<PhotoRole, ExposureTags | null>, 'on');
  if (!exp.known) warnings.push({ code: 'exposure-unknown', message: `no exposure time, f-number and ISO in the EXIF of: ${exp.missing.join(', ')}; equal exposure assumed` });
  for (const role of roles) {
    const pages = photos[role]?.pages;
    if (pages && pages.count > 1) {
      warnings.push({ code: 'multi-page', message: `the ${role} photo's file holds ${pages.count} pages; page ${pages.measured + 1} was measured: export the frame you mean as a file of its own if that is not the one` });
    }
  }
  // a merged bracket's gain folds into its exposure scale; single photos have none, so their scale is untouched
  const scale: Partial<Record<PhotoRole, number>> = {};
  for (const role of roles) {
    const s = (exp.scales as Partial<Record<PhotoRole, number>>)[role] ?? 1;
    const g = photos[role]?.gain;
    scale[role] = g === undefined ? s : s * g;
  }
  const factor = downsampleFactor(W, MAP_MAX_WIDTH);
  const small: Partial<Record<PhotoRole, Plane>> = {};
  const key: Partial<Record<PhotoRole, string>> = {};
  for (const role of roles) {
    const p = photos[role] as CapturePhoto;
    const expected = { w: Math.max(1, Math.floor(W / factor)), h: Math.max(1, Math.floor(H / factor)) };
    const given = p.small && p.small.width === expected.w && p.small.height === expected.h ? p.small : preparePhoto(p.raster);
    key[role] = `${idOf(p.raster)}/${idOf(given)}*${scale[role]}`;
    small[role] = cached(memo, `small:${key[role]}`, () => scalePlane(given, scale[role] as number));
  }
  return { photos, roles, width: W, height: H, scale, exposure: { known: exp.known, scales: exp.scales }, factor, small, key, warnings };
}
