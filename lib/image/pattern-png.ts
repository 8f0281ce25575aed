import sharp from 'sharp';
import { type PatternKind, renderPattern } from '../patterns';

/** PNG bytes of a test pattern at exactly width × height (RangeError for sizes outside 16…8192). */
export async function patternPng(kind: PatternKind, width: number, height: number): Promise<Buffer> {
  const img = renderPattern(kind, width, height);
  return sharp(img.data, { raw: { width: img.width, height: img.height, channels: img.channels } })
    .png({ compressionLevel: 6 })
    .toBuffer();
}
