import { PATTERN_MAX_SIZE, PATTERN_MIN_SIZE, type RgbImage } from './types';

/** Refuses sides that are not whole numbers from 16 to 8192 with a RangeError. */
export function assertPatternSize(width: number, height: number): void {
  for (const [name, v] of [
    ['width', width],
    ['height', height],
  ] as const) {
    if (!Number.isInteger(v) || v < PATTERN_MIN_SIZE || v > PATTERN_MAX_SIZE) {
      throw new RangeError(`${name} must be a whole number from ${PATTERN_MIN_SIZE} to ${PATTERN_MAX_SIZE} pixels (got ${String(v)})`);
    }
  }
}

/** A blank image of one grey level, after checking the size. */
export function solidImage(width: number, height: number, level: number): RgbImage {
  assertPatternSize(width, height);
  if (!Number.isInteger(level) || level < 0 || level > 255) throw new RangeError(`level must be 0…255 (got ${level})`);
  const data = new Uint8Array(width * height * 3);
  if (level !== 0) data.fill(level);
  return { data, width, height, channels: 3 };
}

/** Fills the rectangle [x0, x1) × [y0, y1), clipped to the image, with one grey level. */
export function fillRect(img: RgbImage, x0: number, y0: number, x1: number, y1: number, level: number): void {
  const xa = Math.max(0, Math.min(img.width, Math.round(x0)));
  const xb = Math.max(0, Math.min(img.width, Math.round(x1)));
  const ya = Math.max(0, Math.min(img.height, Math.round(y0)));
  const yb = Math.max(0, Math.min(img.height, Math.round(y1)));
  if (xb <= xa) return;
  for (let y = ya; y < yb; y++) {
    img.data.fill(level, (y * img.width + xa) * 3, (y * img.width + xb) * 3);
  }
}
