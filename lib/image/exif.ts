import exifr from 'exifr';
import type { ExposureTags } from '../photometry/types';

const PICK = ['ExposureTime', 'FNumber', 'ISO', 'ISOSpeedRatings', 'PhotographicSensitivity', 'Make', 'Model', 'FocalLength', 'FocalLengthIn35mmFormat', 'FocalPlaneXResolution', 'FocalPlaneResolutionUnit', 'ExifImageWidth', 'ExifImageHeight'];

/**
 * What a camera can put in its EXIF; anything outside is dropped rather than taken as a fact about
 * the shot (a 10⁹ s exposure would scale the photo by a billion). The intake (lib/server/storage) and the
 * engine's own reading of the tags use the same bounds.
 */
export const EXIF_BOUNDS = {
  exposureTime: [1e-6, 3600],
  fNumber: [0.5, 256],
  iso: [1, 1e7],
  orientation: [1, 8],
  focalLength: [0.5, 5000],
  focalLength35mm: [1, 10000],
  // 0.5 µm to 50 µm pixels
  focalPlanePxPerMm: [20, 2000],
  exifLongSide: [1, 100_000],
} as const satisfies Record<string, readonly [number, number]>;

export function withinBounds(v: number | undefined, [lo, hi]: readonly [number, number]): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v >= lo && v <= hi;
}

/** An EXIF text field without control characters, trimmed and at most 80 characters; undefined when empty. */
export function exifText(v: string | undefined): string | undefined {
  return v ? v.replace(/[\u0000-\u001f\u007f]/g, '').trim().slice(0, 80) || undefined : undefined;
}

function num(v: unknown): number | undefined {
  if (typeof v === 'number' && Number.isFinite(v) && v > 0) return v;
  if (Array.isArray(v) && typeof v[0] === 'number') return num(v[0]);
  return undefined;
}

/**
 * Millimetres per EXIF FocalPlaneResolutionUnit (exifr gives its name, other readers its code): inch
 * when the tag is missing, as EXIF 2.32 defines; null for 'None' or anything unknown.
 */
export function focalPlaneUnitMm(unit: unknown): number | null {
  if (unit === undefined || unit === null) return 25.4;
  const u = typeof unit === 'string' ? unit.trim().toLowerCase() : unit;
  if (u === 2 || u === 'inch' || u === 'inches') return 25.4;
  if (u === 3 || u === 'centimeter' || u === 'centimetre' || u === 'cm') return 10;
  if (u === 4 || u === 'millimeter' || u === 'millimetre' || u === 'mm') return 1;
  if (u === 5 || u === 'micrometer' || u === 'micrometre' || u === 'µm' || u === 'um') return 0.001;
  return null;
}

/** Exposure time, f-number, ISO, make, model, focal length and the focal plane's pixels per mm from a photo's EXIF; null when it has none. */
export async function readExposureTags(buf: Uint8Array): Promise<ExposureTags | null> {
  let tags: Record<string, unknown> | undefined;
  try {
    tags = (await exifr.parse(Buffer.from(buf.buffer, buf.byteOffset, buf.byteLength), { pick: PICK })) as Record<string, unknown> | undefined;
  } catch {
    return null;
  }
  if (!tags) return null;
  const out: ExposureTags = {};
  const t = num(tags.ExposureTime);
  const n = num(tags.FNumber);
  const s = num(tags.ISO) ?? num(tags.ISOSpeedRatings) ?? num(tags.PhotographicSensitivity);
  if (withinBounds(t, EXIF_BOUNDS.exposureTime)) out.exposureTime = t;
  if (withinBounds(n, EXIF_BOUNDS.fNumber)) out.fNumber = n;
  if (withinBounds(s, EXIF_BOUNDS.iso)) out.iso = s;
  const make = typeof tags.Make === 'string' ? exifText(tags.Make) : undefined;
  const model = typeof tags.Model === 'string' ? exifText(tags.Model) : undefined;
  if (make) out.make = make;
  if (model) out.model = model;
  const f = num(tags.FocalLength);
  const f35 = num(tags.FocalLengthIn35mmFormat);
  const res = num(tags.FocalPlaneXResolution);
  const mmPerUnit = focalPlaneUnitMm(tags.FocalPlaneResolutionUnit);
  const pxPerMm = res !== undefined && mmPerUnit !== null ? res / mmPerUnit : undefined;
  const long = Math.max(num(tags.ExifImageWidth) ?? 0, num(tags.ExifImageHeight) ?? 0);
  if (withinBounds(f, EXIF_BOUNDS.focalLength)) out.focalLength = f;
  if (withinBounds(f35, EXIF_BOUNDS.focalLength35mm)) out.focalLength35mm = f35;
  if (withinBounds(pxPerMm, EXIF_BOUNDS.focalPlanePxPerMm)) {
    out.focalPlanePxPerMm = pxPerMm;
    // the recorded size the focal plane resolution refers to (only of use beside it)
    if (withinBounds(long, EXIF_BOUNDS.exifLongSide)) out.exifLongSide = long;
  }
  return Object.keys(out).length > 0 ? out : null;
}
