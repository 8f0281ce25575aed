import { solidImage } from './image';
import { encodeSrgb } from './srgb';
import type { RgbImage } from './types';

/** Turn of the slanted-edge pattern's square from the display's pixel rows, degrees. */
export const SLANTED_EDGE_ANGLE_DEG = 5;
/** Side of the dark square as a share of the display's shorter side. */
export const SLANTED_EDGE_SQUARE_SHARE = 0.5;

/** Where the slanted-edge pattern's square lies, in display pixels. */
export interface SlantedEdgeLayout {
  /** Centre of the square. */
  cx: number;
  cy: number;
  /** Side of the square. */
  side: number;
  /** Turn, degrees (counter-clockwise as drawn, y down). */
  angleDeg: number;
}

export function slantedEdgeLayout(width: number, height: number): SlantedEdgeLayout {
  return { cx: width / 2, cy: height / 2, side: Math.round(SLANTED_EDGE_SQUARE_SHARE * Math.min(width, height)), angleDeg: SLANTED_EDGE_ANGLE_DEG };
}

/**
 * White field with a black square at its centre turned by 5°: each side of the square is a dark/bright
 * edge slanted against the pixel grid, for the slanted-edge MTF (docs/method.md §5.10). The field
 * around the square stays white, so the screen's outline shows as with the other patterns. Pixels
 * the square's border crosses are drawn at the share of their area it covers (8 × 8 samples), in
 * linear light through the sRGB encoding, so the edge lies where it should to a fraction of a pixel.
 */
export function slantedEdgePattern(width: number, height: number): RgbImage {
  const img = solidImage(width, height, 255);
  const { cx, cy, side, angleDeg } = slantedEdgeLayout(width, height);
  const t = (angleDeg * Math.PI) / 180;
  const c = Math.cos(t);
  const s = Math.sin(t);
  const h = side / 2;
  // a point's coordinates in the square's own frame; inside when both are within ±h
  const inside = (x: number, y: number): boolean => {
    const dx = x - cx;
    const dy = y - cy;
    return Math.abs(dx * c + dy * s) <= h && Math.abs(-dx * s + dy * c) <= h;
  };
  const codes = new Uint8Array(65);
  // Source: IEC 61966-2-1:1999 encoding of the uncovered (white) share of the pixel's area
  for (let k = 0; k <= 64; k++) codes[k] = Math.round(255 * encodeSrgb(1 - k / 64));
  const reach = h * Math.SQRT2 + 2;
  const y0 = Math.max(0, Math.floor(cy - reach));
  const y1 = Math.min(height, Math.ceil(cy + reach));
  const x0 = Math.max(0, Math.floor(cx - reach));
  const x1 = Math.min(width, Math.ceil(cx + reach));
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      // the pixel's centre in the square's frame: whole pixels well inside or outside need no sampling
      const dx = x + 0.5 - cx;
      const dy = y + 0.5 - cy;
      const u = Math.abs(dx * c + dy * s);
      const v = Math.abs(-dx * s + dy * c);
      let covered: number;
      if (Math.max(u, v) < h - 0.75) covered = 64;
      else if (u > h + 0.75 || v > h + 0.75) covered = 0;
      else {
        covered = 0;
        for (let j = 0; j < 8; j++) for (let i = 0; i < 8; i++) if (inside(x + (i + 0.5) / 8, y + (j + 0.5) / 8)) covered++;
      }
      if (covered > 0) img.data.fill(codes[covered] as number, (y * width + x) * 3, (y * width + x) * 3 + 3);
    }
  }
  return img;
}
