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

/** The rectangle grown by `z` pixels on every side (shrunk when z < 0); null when nothing is left. */
export function growRect(r: Rect, z: number): Rect | null {
  const out = { x: r.x - z, y: r.y - z, w: r.w + 2 * z, h: r.h + 2 * z };
  return out.w >= 1 && out.h >= 1 ? out : null;
}

/** a minus b as at most four disjoint rectangles (rows above, rows below, then the columns beside b). */
export function subtractRect(a: Rect, b: Rect): Rect[] {
  const x0 = Math.max(a.x, b.x);
  const x1 = Math.min(a.x + a.w, b.x + b.w);
  const y0 = Math.max(a.y, b.y);
  const y1 = Math.min(a.y + a.h, b.y + b.h);
  if (x1 <= x0 || y1 <= y0) return [{ ...a }];
  const out: Rect[] = [];
  if (y0 > a.y) out.push({ x: a.x, y: a.y, w: a.w, h: y0 - a.y });
  if (a.y + a.h > y1) out.push({ x: a.x, y: y1, w: a.w, h: a.y + a.h - y1 });
  if (x0 > a.x) out.push({ x: a.x, y: y0, w: x0 - a.x, h: y1 - y0 });
  if (a.x + a.w > x1) out.push({ x: x1, y: y0, w: a.x + a.w - x1, h: y1 - y0 });
  return out;
}

/**
 * The part of a ghost's band that holds only the ghost's plateau: the screen moved by `offset` and
 * shrunk by the edge zone `zone` (so the ghost's own soft edge is left out), minus the screen grown
 * by the same zone (so the screen's own spill is left out). docs/method.md §5.8.
 */
export function ghostBandRects(screen: Rect, offset: Offset, zone: number): Rect[] {
  if (!Number.isInteger(zone) || zone < 0) throw new RangeError('the edge zone must be a whole number of pixels ≥ 0');
  const moved = growRect({ x: screen.x + offset.dx, y: screen.y + offset.dy, w: screen.w, h: screen.h }, -zone);
  const grown = growRect(screen, zone) as Rect;
  return moved ? subtractRect(moved, grown) : [];
}
