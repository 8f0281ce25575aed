import type { Rect } from './types';

/** Throws RangeError unless the rectangle has integer coordinates, w, h ≥ 1 and lies inside width × height. */
export function assertRectInside(rect: Rect, width: number, height: number, name = 'rect'): void {
  const { x, y, w, h } = rect;
  if (![x, y, w, h].every(Number.isInteger)) throw new RangeError(`${name} must have integer x, y, w, h`);
  if (w < 1 || h < 1) throw new RangeError(`${name} is empty (${w} × ${h})`);
  if (x < 0 || y < 0 || x + w > width || y + h > height) {
    throw new RangeError(`${name} ${x},${y},${w},${h} lies outside the ${width} × ${height} image`);
  }
}

/** Intersection of two rectangles, or null when they do not overlap. */
export function intersectRects(a: Rect, b: Rect): Rect | null {
  const x0 = Math.max(a.x, b.x);
  const y0 = Math.max(a.y, b.y);
  const x1 = Math.min(a.x + a.w, b.x + b.w);
  const y1 = Math.min(a.y + a.h, b.y + b.h);
  return x1 > x0 && y1 > y0 ? { x: x0, y: y0, w: x1 - x0, h: y1 - y0 } : null;
}

/** Smallest rectangle holding all the given ones. */
export function unionRects(rects: readonly Rect[]): Rect {
  if (rects.length === 0) throw new RangeError('unionRects needs at least one rectangle');
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (const r of rects) {
    x0 = Math.min(x0, r.x);
    y0 = Math.min(y0, r.y);
    x1 = Math.max(x1, r.x + r.w);
    y1 = Math.max(y1, r.y + r.h);
  }
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

/** Intersection over union of two rectangles (0 when disjoint). */
export function rectIoU(a: Rect, b: Rect): number {
  const i = intersectRects(a, b);
  if (i === null) return 0;
  const inter = i.w * i.h;
  return inter / (a.w * a.h + b.w * b.h - inter);
}

/** The rectangle moved by (dx, dy). */
export function translateRect(r: Rect, dx: number, dy: number): Rect {
  return { x: r.x + dx, y: r.y + dy, w: r.w, h: r.h };
}

/**
 * Splits a rectangle into cols × rows cells (row-major) and keeps the central `keep` share of each
 * cell's width and height (1 = whole cell). Cell edges are rounded so the cells tile the rectangle.
 */
export function gridCells(rect: Rect, cols: number, rows: number, keep = 1): Rect[] {
  if (!Number.isInteger(cols) || !Number.isInteger(rows) || cols < 1 || rows < 1) {
    throw new RangeError('cols and rows must be positive integers');
  }
  if (!(keep > 0 && keep <= 1)) throw new RangeError('keep must be in (0, 1]');
  const cells: Rect[] = [];
  for (let j = 0; j < rows; j++) {
    const y0 = rect.y + Math.round((j * rect.h) / rows);
    const y1 = rect.y + Math.round(((j + 1) * rect.h) / rows);
    for (let i = 0; i < cols; i++) {
      const x0 = rect.x + Math.round((i * rect.w) / cols);
      const x1 = rect.x + Math.round(((i + 1) * rect.w) / cols);
      const cw = x1 - x0;
      const ch = y1 - y0;
      const mx = Math.round((cw * (1 - keep)) / 2);
      const my = Math.round((ch * (1 - keep)) / 2);
      cells.push({ x: x0 + mx, y: y0 + my, w: cw - 2 * mx, h: ch - 2 * my });
    }
  }
  for (const c of cells) if (c.w < 1 || c.h < 1) throw new RangeError(`rectangle ${rect.w} × ${rect.h} is too small for a ${cols} × ${rows} grid`);
  return cells;
}
