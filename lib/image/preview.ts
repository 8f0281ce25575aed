import sharp from 'sharp';
import { MAX_PIXELS } from './decode';
import { rawPreview, sniffRaw } from './raw';

/** Widest or tallest side of the editor's preview. */
export const PREVIEW_MAX_SIDE = 1600;

/**
 * A WebP preview of at most 1600 px a side, EXIF orientation applied so it matches the engine's
 * full-resolution coordinates. Decoding the whole file here also catches truncated photos.
 */
export async function makePreview(bytes: Uint8Array, name = 'photo'): Promise<{ webp: Buffer; width: number; height: number }> {
  const rawKind = sniffRaw(bytes, name);
  // a camera raw photo: a half-size decode by the libraw tools (no demosaicing; orientation applied)
  const source = rawKind ? await rawPreview(bytes, name, rawKind).then((p) => sharp(p.rgb, { raw: { width: p.width, height: p.height, channels: 3 } })) : sharp(bytes, { limitInputPixels: MAX_PIXELS, failOn: 'truncated' });
  const { data, info } = await source
    .rotate()
    .resize({ width: PREVIEW_MAX_SIDE, height: PREVIEW_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
    .toColourspace('srgb')
    .webp({ quality: 82 })
    .toBuffer({ resolveWithObject: true });
  return { webp: data, width: info.width, height: info.height };
}
