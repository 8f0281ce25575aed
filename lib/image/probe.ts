import exifr from 'exifr';
import sharp, { type Metadata } from 'sharp';
import { EngineInputError } from '../photometry/errors';
import { MAX_PIXELS } from './decode';
import { encodingFromFile, type FileEncoding } from './encoding';
import { identifyRaw, RAW_LIST, RAW_TYPES, sniffRaw, type RawKind } from './raw';
import { refuseUnsupported } from './sniff';

export type ProbedPhoto = {
  /** A camera raw photo has its raw format here (dng, cr2, …): the worker decodes it (lib/image/raw.ts). */
  format: 'jpeg' | 'png' | 'tiff' | 'webp' | RawKind;
  ext: 'jpg' | 'png' | 'tif' | 'webp' | string;
  contentType: string;
  /** Size after EXIF orientation, which is how the engine and the editor see the photo. */
  width: number;
  height: number;
  bitDepth: 8 | 16;
  /** How the file says its values encode light (see lib/image/encoding.ts for the rule). */
  encoding: FileEncoding;
  /** Pages in the file (a TIFF may hold several; the first is measured). */
  pages: number;
  exif: { exposureTime?: number; fNumber?: number; iso?: number; make?: string; model?: string; lens?: string; takenAt?: string; orientation?: number };
};

const SEND = `send JPEG, PNG, TIFF or WebP, or the camera's raw file (${RAW_LIST})`;
const TYPES = {
  jpeg: { ext: 'jpg', contentType: 'image/jpeg' },
  png: { ext: 'png', contentType: 'image/png' },
  tiff: { ext: 'tif', contentType: 'image/tiff' },
  webp: { ext: 'webp', contentType: 'image/webp' },
} as const;

// magic numbers decide the type; the file name only sharpens the message for raw files
function looksLikeImage(b: Uint8Array): boolean {
  if (b.length < 12) return false;
  const jpeg = b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff;
  const png = b[0] === 0x89 && b[1] === 0x50 && b[2] === 0x4e && b[3] === 0x47;
  const tiff = (b[0] === 0x49 && b[1] === 0x49 && b[2] === 0x2a) || (b[0] === 0x4d && b[1] === 0x4d && b[3] === 0x2a);
  const webp = String.fromCharCode(...b.subarray(0, 4)) === 'RIFF' && String.fromCharCode(...b.subarray(8, 12)) === 'WEBP';
  return jpeg || png || tiff || webp;
}

function num(v: unknown): number | undefined {
  return typeof v === 'number' && Number.isFinite(v) && v > 0 ? v : undefined;
}

async function exifSummary(bytes: Uint8Array): Promise<ProbedPhoto['exif']> {
  try {
    const t = (await exifr.parse(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), {
      pick: ['ExposureTime', 'FNumber', 'ISO', 'ISOSpeedRatings', 'Make', 'Model', 'LensModel', 'DateTimeOriginal', 'Orientation'],
      translateValues: false,
    })) as Record<string, unknown> | undefined;
    if (!t) return {};
    const out: ProbedPhoto['exif'] = {};
    const iso = num(t.ISO) ?? (Array.isArray(t.ISOSpeedRatings) ? num(t.ISOSpeedRatings[0]) : num(t.ISOSpeedRatings));
    if (num(t.ExposureTime)) out.exposureTime = num(t.ExposureTime);
    if (num(t.FNumber)) out.fNumber = num(t.FNumber);
    if (iso) out.iso = iso;
    if (typeof t.Make === 'string') out.make = t.Make.trim().slice(0, 80);
    if (typeof t.Model === 'string') out.model = t.Model.trim().slice(0, 80);
    if (typeof t.LensModel === 'string') out.lens = t.LensModel.trim().slice(0, 80);
    if (t.DateTimeOriginal instanceof Date && !Number.isNaN(t.DateTimeOriginal.getTime())) out.takenAt = t.DateTimeOriginal.toISOString();
    if (num(t.Orientation)) out.orientation = num(t.Orientation);
    return out;
  } catch {
    return {};
  }
}

/**
 * Decodes the whole file once, shrunk on load so memory stays small, and refuses it when the
 * decoder reports anything amiss: a header can declare 9999 × 9999 pixels over a few kilobytes of
 * data, which decoders otherwise fill with grey and the analysis later blames on camera motion.
 */
async function refuseCorrupt(bytes: Uint8Array, name: string, w: number, h: number): Promise<void> {
  try {
    await sharp(bytes, { failOn: 'warning', limitInputPixels: MAX_PIXELS, sequentialRead: true })
      .resize({ width: 256, height: 256, fit: 'inside', withoutEnlargement: true })
      .raw()
      .toBuffer();
  } catch {
    throw new EngineInputError('not-an-image', `${name} is damaged or cut short: it declares ${w} × ${h} pixels but its image data is corrupt or ends early. Copy the original file from the camera again`);
  }
}

/**
 * Decides an upload's type from its content and reads its size and EXIF, refusing what the engine
 * cannot measure with an EngineInputError whose message says what to send instead.
 */
export async function probePhoto(bytes: Uint8Array, name: string): Promise<ProbedPhoto> {
  if (bytes.length === 0) throw new EngineInputError('not-an-image', `${name} is empty (0 bytes): pick the photo file again`);
  const rawKind = sniffRaw(bytes, name);
  if (rawKind) return probeRaw(bytes, name, rawKind);
  refuseUnsupported(bytes, name);
  if (!looksLikeImage(bytes)) throw new EngineInputError('not-an-image', `${name} is not an image: ${SEND}`);
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch {
    throw new EngineInputError('not-an-image', `${name} is damaged and cannot be read as an image: ${SEND}`);
  }
  const format = meta.format as string;
  if (format !== 'jpeg' && format !== 'png' && format !== 'tiff' && format !== 'webp') throw new EngineInputError('unsupported-format', `${name}: ${format.toUpperCase()} is not supported: ${SEND}`);
  if ((meta.pages ?? 1) > 1 && format !== 'tiff') throw new EngineInputError('animated', `${name} is animated: send one still frame as JPEG, PNG or TIFF`);
  const w = meta.width ?? 0;
  const h = meta.height ?? 0;
  if (w < 16 || h < 16) throw new EngineInputError('not-an-image', `${name} is only ${w} × ${h} pixels: send the full camera photo`);
  if (w * h > MAX_PIXELS) {
    throw new EngineInputError('too-large', `${name} has ${Math.round((w * h) / 1e6)} megapixels (${w} × ${h}), more than 100: downscale it or crop to the eyepiece view`);
  }
  await refuseCorrupt(bytes, name, w, h);
  const rotated = (meta.orientation ?? 1) >= 5;
  const t = TYPES[format];
  const sixteen = meta.depth === 'ushort' || meta.depth === 'short';
  return {
    format,
    ext: t.ext,
    contentType: t.contentType,
    width: rotated ? h : w,
    height: rotated ? w : h,
    bitDepth: sixteen ? 16 : 8,
    encoding: encodingFromFile({ format, sixteen, icc: meta.icc ?? null, bytes }),
    pages: Math.max(1, meta.pages ?? 1),
    exif: await exifSummary(bytes),
  };
}

/**
 * A camera raw photo is checked from its header only (raw-identify: a format libraw reads, its size
 * within the limits, its exposure tags); its pixels are decoded by the worker, always as linear light.
 */
async function probeRaw(bytes: Uint8Array, name: string, kind: RawKind): Promise<ProbedPhoto> {
  const info = await identifyRaw(bytes, name, kind);
  // lens and date from the EXIF where exifr reads the container (TIFF-based raws); the exposure
  // tags, make and model from libraw, which reads every raw format the same way
  const { lens, takenAt } = await exifSummary(bytes);
  const exif: ProbedPhoto['exif'] = { ...(lens ? { lens } : {}), ...(takenAt ? { takenAt } : {}), ...(info.exposure ?? {}) };
  return {
    format: kind,
    ext: RAW_TYPES[kind].ext,
    contentType: RAW_TYPES[kind].contentType,
    width: info.width,
    height: info.height,
    bitDepth: 16,
    encoding: { encoding: 'linear', reason: `camera raw (${RAW_TYPES[kind].label}), decoded to linear 16-bit with one fixed white balance for the set` },
    pages: 1,
    exif,
  };
}
