import { solidImage } from './image';
import type { RgbImage } from './types';

/** Full-field white (255, 255, 255). */
export function whitePattern(width: number, height: number): RgbImage {
  return solidImage(width, height, 255);
}

/** Full-field black (0, 0, 0). */
export function blackPattern(width: number, height: number): RgbImage {
  return solidImage(width, height, 0);
}
