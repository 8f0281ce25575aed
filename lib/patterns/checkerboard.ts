import { solidImage } from './image';
import type { RgbImage } from './types';

/**
 * 4 × 4 checkerboard of 8 white and 8 black cells, top-left white (inverse: top-left black).
 * Column k covers the pixels x with ⌊4x/width⌋ = k, so cell edges sit at exact quarters and
 * odd sizes split as evenly as whole pixels allow.
 */
export function checkerboardPattern(width: number, height: number, inverse = false): RgbImage {
  // Source: 4 × 4 checkerboard of ANSI/NAPM IT7.228-1997 and ANSI/InfoComm 3M-2011.
  const img = solidImage(width, height, 0);
  const col = new Uint8Array(width);
  for (let x = 0; x < width; x++) col[x] = Math.floor((4 * x) / width);
  for (let y = 0; y < height; y++) {
    const row = Math.floor((4 * y) / height);
    const base = y * width * 3;
    for (let x = 0; x < width; x++) {
      const white = (((col[x] as number) + row) % 2 === 0) !== inverse;
      if (white) img.data.fill(255, base + x * 3, base + x * 3 + 3);
    }
  }
  return img;
}

/** Row and column (0…3) of the checkerboard cell holding pixel (x, y). */
export function checkerboardCell(x: number, y: number, width: number, height: number): { row: number; col: number } {
  return { row: Math.floor((4 * y) / height), col: Math.floor((4 * x) / width) };
}
