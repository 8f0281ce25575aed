import { fillRect, solidImage } from './image';
import type { RgbImage } from './types';

/** Grey level of the aiming marks: visible on white, but far from black so a cell mean hardly moves. */
export const UNIFORMITY_MARK_LEVEL = 128;

/** Centre of 3 × 3 grid cell (row, col), in pixel coordinates (cell edges at exact thirds). */
export function uniformityPoint(row: number, col: number, width: number, height: number): { x: number; y: number } {
  if (![0, 1, 2].includes(row) || ![0, 1, 2].includes(col)) throw new RangeError('row and col must be 0, 1 or 2');
  return { x: ((2 * col + 1) * width) / 6, y: ((2 * row + 1) * height) / 6 };
}

/**
 * White field with a thin grey crosshair at the centre of each cell of a 3 × 3 grid, for 9-point
 * measurement. Each crosshair leaves an open white centre (the spot a meter reads), and every
 * cell carries the identical mark, so cell-to-cell ratios are not biased by the marks.
 */
export function uniformityPattern(width: number, height: number): RgbImage {
  const img = solidImage(width, height, 255);
  const short = Math.min(width, height);
  const t = Math.max(1, Math.round(short / 360));
  const arm = Math.max(2, Math.round(short / 24));
  const gap = Math.max(1, Math.round(arm / 3));
  const cw = Math.floor(width / 3);
  const ch = Math.floor(height / 3);
  for (let row = 0; row < 3; row++) {
    for (let col = 0; col < 3; col++) {
      // Drawn relative to each cell's own whole-pixel origin, so the nine marks are pixel-identical.
      const ox = Math.floor((col * width) / 3);
      const oy = Math.floor((row * height) / 3);
      const cx = ox + Math.floor(cw / 2);
      const cy = oy + Math.floor(ch / 2);
      const h0 = cy - Math.floor(t / 2);
      const v0 = cx - Math.floor(t / 2);
      fillRect(img, cx - arm, h0, cx - gap, h0 + t, UNIFORMITY_MARK_LEVEL);
      fillRect(img, cx + gap + 1, h0, cx + arm + 1, h0 + t, UNIFORMITY_MARK_LEVEL);
      fillRect(img, v0, cy - arm, v0 + t, cy - gap, UNIFORMITY_MARK_LEVEL);
      fillRect(img, v0, cy + gap + 1, v0 + t, cy + arm + 1, UNIFORMITY_MARK_LEVEL);
    }
  }
  return img;
}
