import { exposureFactor } from './exposure';
import { measureRects, totalsMean } from './region-pass';
import { METER_K, METERED_TONE } from './meter';
import type { ExposureTags, PhotoRaster, Rect } from './types';

/** Share of clipped pixels in the patch above which a calibration is refused (docs/method.md §5.5). */
export const CALIBRATION_MAX_CLIPPED = 0.001;
/** Patch level (linear Y) below which read noise and quantisation dominate. */
export const CALIBRATION_MIN_LEVEL = 0.01;

/**
 * Camera factor k in cd/m² per unit of Y·N²/(t·S) from a patch of known luminance:
 * L = k·Y/E with E = t·S/N², so k = L·E/Y.
 */
export function calibrationFactor(meterCdm2: number, meanY: number, exposure: number): number {
  for (const [name, v] of [['meter reading', meterCdm2], ['patch level', meanY], ['exposure', exposure]] as const) {
    if (!Number.isFinite(v) || v <= 0) throw new RangeError(`${name} must be a positive number, got ${v}`);
  }
  // docs/method.md §5.4: L = k·Y·N²/(t·S)
  return (meterCdm2 * exposure) / meanY;
}

/** Luminance in cd/m² of a relative level Y taken at exposure E with camera factor k. */
export function absoluteLuminance(k: number, y: number, exposure: number): number {
  if (!Number.isFinite(k) || k <= 0) throw new RangeError(`k must be a positive number, got ${k}`);
  if (!Number.isFinite(exposure) || exposure <= 0) throw new RangeError(`exposure must be a positive number, got ${exposure}`);
  if (!Number.isFinite(y)) throw new RangeError(`the level must be a number, got ${y}`);
  return (k * y) / exposure;
}

/**
 * The k an uncalibrated camera is assumed to have by the rough estimate: a meter's mid-tone lands
 * at 18% of full scale, so L = (K·N²/(t·S))·Y/0.18 and k = K/0.18 whatever the settings.
 */
export function roughCalibrationFactor(meterK = METER_K): number {
  if (!Number.isFinite(meterK) || meterK <= 0) throw new RangeError(`K must be a positive number, got ${meterK}`);
  // ISO 2720 meter equation N²/t = L·S/K with the metered tone at Y = 0.18
  return meterK / METERED_TONE;
}

export interface PatchCalibration {
  k: number;
  /** Mean relative luminance over the patch. */
  meanY: number;
  exposure: number;
  clippedFraction: number;
  pixels: number;
}

/**
 * Calibrates from one photo: mean Y over the marked patch, the photo's exposure and the spot
 * meter's reading of the same patch. Throws RangeError with a message a person can act on.
 */
export function calibrateFromPatch(raster: PhotoRaster, patch: Rect, tags: ExposureTags | null | undefined, meterCdm2: number): PatchCalibration {
  if (![patch.x, patch.y, patch.w, patch.h].every(Number.isInteger) || patch.w < 1 || patch.h < 1) throw new RangeError('the patch must be whole pixels x, y, w, h with a width and height of at least 1');
  if (patch.x < 0 || patch.y < 0 || patch.x + patch.w > raster.width || patch.y + patch.h > raster.height) {
    throw new RangeError(`the patch ${patch.x},${patch.y},${patch.w},${patch.h} lies outside the ${raster.width} × ${raster.height} photo`);
  }
  if (!Number.isFinite(meterCdm2) || meterCdm2 <= 0) throw new RangeError('the meter reading must be a positive number of cd/m²');
  const e = exposureFactor(tags);
  if (e === null) throw new RangeError('the photo has no exposure time, f-number and ISO in its EXIF: export it with its EXIF kept');
  const [t] = measureRects(raster, [{ rect: patch }], { dx: 0, dy: 0 }, 1);
  if (!t) throw new RangeError('the patch could not be measured');
  const meanY = totalsMean(t);
  const clippedFraction = t.n > 0 ? t.clipped / t.n : 0;
  if (clippedFraction > CALIBRATION_MAX_CLIPPED) throw new RangeError(`${(100 * clippedFraction).toFixed(1)}% of the patch is clipped: lower the exposure and shoot it again`);
  if (!(meanY >= CALIBRATION_MIN_LEVEL)) throw new RangeError(`the patch is too dark (mean level ${meanY.toFixed(4)} of full scale): raise the exposure so it sits well above black`);
  return { k: calibrationFactor(meterCdm2, meanY, e), meanY, exposure: e, clippedFraction, pixels: t.n };
}
