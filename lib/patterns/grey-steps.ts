import { solidImage } from './image';
import { decodeSrgb, encodeSrgb } from './srgb';
import type { RgbImage } from './types';

/** One band of the grey-steps pattern. */
export interface GreyStep {
  index: number;
  /** Intended linear luminance relative to white (0, 0.1, …, 1). */
  target: number;
  /** The 8-bit sRGB code drawn. */
  code: number;
  /** Linear luminance of that code after sRGB decoding: what a linearity check should expect. */
  linear: number;
}

/** Eleven steps of equal linear luminance, 0% to 100% in 10% steps, left to right. */
export const GREY_STEPS: readonly GreyStep[] = Object.freeze(
  Array.from({ length: 11 }, (_, index) => {
    const target = index / 10;
    // Source: IEC 61966-2-1:1999 encoding, rounded to the nearest 8-bit code.
    const code = Math.round(255 * encodeSrgb(target));
    return Object.freeze({ index, target, code, linear: decodeSrgb(code / 255) });
  }),
);

/** Linear luminances of the drawn steps, in order (for a linearity check). */
export const GREY_STEP_LINEAR: readonly number[] = Object.freeze(GREY_STEPS.map((s) => s.linear));

/** Index (0…10) of the grey step holding column x. */
export function greyStepAt(x: number, width: number): number {
  return Math.floor((GREY_STEPS.length * x) / width);
}

/** Eleven full-height vertical bands of equal linear-luminance steps, black on the left, white on the right. */
export function greyStepsPattern(width: number, height: number): RgbImage {
  const img = solidImage(width, height, 0);
  const row = new Uint8Array(width * 3);
  for (let x = 0; x < width; x++) {
    const step = GREY_STEPS[greyStepAt(x, width)];
    row.fill(step ? step.code : 0, x * 3, x * 3 + 3);
  }
  for (let y = 0; y < height; y++) img.data.set(row, y * width * 3);
  return img;
}
