import type { Offset, Rect } from './types';

/**
 * Calls visit(x, y) for every pixel of the band: the rectangle moved by `offset`, minus the
 * rectangle itself. Touches only the band, so the cost grows with the offset, not with the area.
 */
export function forEachBandPixel(rect: Rect, offset: Offset, visit: (x: number, y: number) => void): void {
  const { x: sx, y: sy, w, h } = rect;
  const { dx, dy } = offset;
  for (let y = sy + dy; y < sy + dy + h; y++) {
    const rowInside = y >= sy && y < sy + h;
    if (!rowInside) {
      for (let x = sx + dx; x < sx + dx + w; x++) visit(x, y);
      continue;
    }
    // on rows the rectangle covers, only the |dx| columns that stick out belong to the band
    if (dx > 0) for (let x = Math.max(sx + w, sx + dx); x < sx + dx + w; x++) visit(x, y);
    else if (dx < 0) for (let x = sx + dx; x < Math.min(sx, sx + dx + w); x++) visit(x, y);
  }
}

/** Number of pixels in the band of `rect` moved by `offset`. */
export function bandArea(rect: Rect, offset: Offset): number {
  const ox = Math.min(rect.w, Math.abs(offset.dx));
  const oy = Math.min(rect.h, Math.abs(offset.dy));
  return rect.w * rect.h - (rect.w - ox) * (rect.h - oy);
}
