import { fillRect, solidImage } from './image';
import type { RgbImage } from './types';

/** Where the orientation pattern's parts are, in pixels, for a detector to look for them. */
export interface OrientationLayout {
  /** Bounding box of the glyph. */
  glyph: { x: number; y: number; w: number; h: number };
  /** The white square in the top-left corner. */
  notch: { x: number; y: number; size: number };
}

/**
 * Layout of the orientation pattern: an "F"-like glyph (a stem with a long top bar and a shorter
 * middle bar, all pointing right) centred on black, plus a white square notch in the top-left
 * corner. Neither part has a mirror or rotation symmetry, so any flip or turn shows.
 */
export function orientationLayout(width: number, height: number): OrientationLayout {
  const short = Math.min(width, height);
  const h = Math.max(7, Math.round(short * 0.6));
  const w = Math.max(5, Math.round((h * 5) / 7));
  const size = Math.max(2, Math.round(short * 0.08));
  return {
    glyph: { x: Math.floor((width - w) / 2), y: Math.floor((height - h) / 2), w, h },
    notch: { x: 0, y: 0, size },
  };
}

/** The orientation pattern: white "F"-like glyph and top-left notch on black. */
export function orientationPattern(width: number, height: number): RgbImage {
  const img = solidImage(width, height, 0);
  const { glyph: g, notch } = orientationLayout(width, height);
  // Proportions on a 5 × 7 unit grid: stem 1 unit wide, top bar 5 units, middle bar 3.5 units.
  const u = g.h / 7;
  const stem = Math.max(1, Math.round(u));
  fillRect(img, g.x, g.y, g.x + stem, g.y + g.h, 255);
  fillRect(img, g.x, g.y, g.x + g.w, g.y + stem, 255);
  const midTop = g.y + Math.round(3 * u);
  fillRect(img, g.x, midTop, g.x + Math.round(3.5 * u), midTop + stem, 255);
  fillRect(img, notch.x, notch.y, notch.x + notch.size, notch.y + notch.size, 255);
  return img;
}
