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

/** The band of `rect` moved by `offset` as at most two rectangles (the rows outside, the columns sticking out). */
export function bandRects(rect: Rect, offset: Offset): Rect[] {
  const { x: sx, y: sy, w, h } = rect;
  const { dx, dy } = offset;
  const out: Rect[] = [];
  const hy0 = dy > 0 ? Math.max(sy + h, sy + dy) : sy + dy;
  const hy1 = dy > 0 ? sy + dy + h : Math.min(sy, sy + dy + h);
  if (dy !== 0 && hy1 > hy0) out.push({ x: sx + dx, y: hy0, w, h: hy1 - hy0 });
  const vy0 = Math.max(sy, sy + dy);
  const vy1 = Math.min(sy + h, sy + dy + h);
  const vx0 = dx > 0 ? Math.max(sx + w, sx + dx) : sx + dx;
  const vx1 = dx > 0 ? sx + dx + w : Math.min(sx, sx + dx + w);
  if (dx !== 0 && vy1 > vy0 && vx1 > vx0) out.push({ x: vx0, y: vy0, w: vx1 - vx0, h: vy1 - vy0 });
  return out;
}
