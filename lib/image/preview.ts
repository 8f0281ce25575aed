import sharp from 'sharp';
import { MAX_PIXELS } from './decode';

/** Widest or tallest side of the editor's preview. */
export const PREVIEW_MAX_SIDE = 1600;

/**
 * A WebP preview of at most 1600 px a side, EXIF orientation applied so it matches the engine's
 * full-resolution coordinates. Decoding the whole file here also catches truncated photos.
 */
export async function makePreview(bytes: Uint8Array): Promise<{ webp: Buffer; width: number; height: number }> {
  const { data, info } = await sharp(bytes, { limitInputPixels: MAX_PIXELS, failOn: 'truncated' })
    .rotate()
    .resize({ width: PREVIEW_MAX_SIDE, height: PREVIEW_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
    .toColourspace('srgb')
    .webp({ quality: 82 })
    .toBuffer({ resolveWithObject: true });
  return { webp: data, width: info.width, height: info.height };
}
