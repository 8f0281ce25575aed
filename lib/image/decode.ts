import sharp, { type Metadata, type OutputInfo } from 'sharp';
import { EngineInputError } from '../photometry/errors';
import type { ExposureTags, PhotoRaster } from '../photometry/types';
import { readExposureTags } from './exif';
import { decodeRaw, RAW_LIST, sniffRaw, type RawKind, type RawWhiteBalance } from './raw';
import { refuseUnsupported } from './sniff';

/** Largest photo accepted (docs/method.md §5.1). */
export const MAX_PIXELS = 100_000_000;

// two decodes share the two cores better than one decode with a single thread
sharp.concurrency(2);

export interface DecodedPhoto {
  raster: PhotoRaster;
  exposure: ExposureTags | null;
  format: 'jpeg' | 'png' | 'tiff' | 'webp' | RawKind;
  /** Pages in the file; only the first (page 0) is decoded and measured. */
  pages: number;
  /** For a camera raw photo: the white balance it was decoded with (lib/image/raw.ts). */
  whiteBalance?: RawWhiteBalance;
}

export interface DecodeOptions {
  /** Name for messages and raw-format detection. */
  name?: string;
  /** Treat a 16-bit TIFF's values as linear rather than sRGB-encoded. */
  linear16?: boolean;
  /** Called once the pixel decode has been handed to sharp's threads (the caller may then keep the main thread busy). */
  onDecodeStarted?: () => void;
  /** A camera raw photo is decoded with this white balance, the one fixed for its whole capture set (lib/image/raw.ts). */
  rawWhiteBalance?: RawWhiteBalance | null;
}

const SEND = `send JPEG, PNG, TIFF or WebP, or the camera's raw file (${RAW_LIST})`;

/**
 * Decodes a JPEG/PNG/TIFF/WebP (8 or 16 bit) with EXIF orientation applied, and reads its exposure
 * tags; a camera raw photo is decoded to linear 16-bit by the libraw tools (lib/image/raw.ts), always
 * read as linear whatever `linear16` says.
 */
export async function decodePhoto(buf: Uint8Array, options: DecodeOptions = {}): Promise<DecodedPhoto> {
  const name = options.name ?? 'photo';
  const rawKind = sniffRaw(buf, name);
  if (rawKind) {
    const d = await decodeRaw(buf, { name, kind: rawKind, whiteBalance: options.rawWhiteBalance, onDecodeStarted: options.onDecodeStarted });
    return { raster: d.raster, exposure: d.exposure, format: rawKind, pages: 1, whiteBalance: d.whiteBalance };
  }
  refuseUnsupported(buf, name);
  let meta: Metadata;
  try {
    meta = await sharp(buf, { limitInputPixels: false }).metadata();
  } catch {
    throw new EngineInputError('not-an-image', `${name} is not an image that can be read: ${SEND}`);
  }
  const format = meta.format as string;
  if (format === 'heif') throw new EngineInputError('unsupported-format', `${name}: HEIC/AVIF is not supported: export the photo as 16-bit TIFF or JPEG`);
  if (format !== 'jpeg' && format !== 'png' && format !== 'tiff' && format !== 'webp') {
    throw new EngineInputError('unsupported-format', `${name}: ${format.toUpperCase()} is not supported: ${SEND}`);
  }
  if ((meta.pages ?? 1) > 1 && format !== 'tiff') {
    throw new EngineInputError('animated', `${name} is animated: send one still frame as JPEG, PNG or TIFF`);
  }
  const w = meta.width ?? 0;
  const h = meta.height ?? 0;
  if (w * h > MAX_PIXELS) {
    throw new EngineInputError('too-large', `${name} has ${(w * h / 1e6).toFixed(0)} megapixels, more than 100: downscale it or send a crop of the eyepiece view`);
  }
  const sixteen = meta.depth === 'ushort' || meta.depth === 'short';
  if (options.linear16 && !(sixteen && format === 'tiff')) {
    throw new EngineInputError('bad-argument', `${name} is not a 16-bit TIFF, so it cannot be declared linear`);
  }
  const grey = (meta.channels ?? 3) < 3 && meta.space !== 'cmyk';
  let pipeline = sharp(buf, { limitInputPixels: MAX_PIXELS, failOn: 'error' }).rotate().removeAlpha();
  pipeline = sixteen ? pipeline.toColourspace(grey ? 'grey16' : 'rgb16') : pipeline.toColourspace(grey ? 'b-w' : 'srgb');
  let out: { data: Buffer; info: OutputInfo };
  try {
    const pending = pipeline.raw(sixteen ? { depth: 'ushort' } : undefined).toBuffer({ resolveWithObject: true });
    options.onDecodeStarted?.();
    out = await pending;
  } catch {
    throw new EngineInputError('not-an-image', `${name} is damaged or truncated and could not be decoded: ${SEND}`);
  }
  const { data, info } = out;
  const channels = info.channels;
  if (channels !== 1 && channels !== 3) throw new EngineInputError('unsupported-format', `${name} has ${channels} colour channels: send JPEG, PNG, TIFF or WebP in RGB`);
  const pixels = sixteen
    ? new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2)
    : new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  const raster: PhotoRaster = {
    data: pixels,
    width: info.width,
    height: info.height,
    channels,
    bitDepth: sixteen ? 16 : 8,
    encoding: options.linear16 ? 'linear' : 'srgb',
  };
  return { raster, exposure: await readExposureTags(buf), format, pages: Math.max(1, meta.pages ?? 1) };
}

/** Decode only, as the benchmark's floor: the same sharp call analyzeFiles makes, without EXIF or checks. */
export async function decodeRawOnly(buf: Uint8Array): Promise<number> {
  const { info } = await sharp(buf, { limitInputPixels: MAX_PIXELS }).rotate().removeAlpha().toColourspace('srgb').raw().toBuffer({ resolveWithObject: true });
  return info.width * info.height;
}
