import sharp from 'sharp';
import { MAX_PIXELS } from './decode';

/** Widest or tallest side of a photo's thumbnail on the capture page (twice its shown size, for dense screens). */
export const THUMBNAIL_MAX_SIDE = 192;

/**
 * A small WebP of a photo, made from its stored preview (already turned upright and in sRGB, so
 * the thumbnail looks like the editor's photo). A few kilobytes, so the page can list every
 * photo of a bracket.
 */
export async function makeThumbnail(preview: Uint8Array): Promise<Buffer> {
  return sharp(preview, { limitInputPixels: MAX_PIXELS })
    .resize({ width: THUMBNAIL_MAX_SIDE, height: THUMBNAIL_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
    .webp({ quality: 70 })
    .toBuffer();
}
