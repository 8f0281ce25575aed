/**
 * The region editor's geometry as plain functions: scaling between the screen and the photo's
 * full-resolution pixels, hit testing, drawing, moving and resizing by drag, keyboard nudges,
 * clamping to the photo, and the detected ghost's rectangle. The component only wires them to
 * pointer and key events.
 */
import type { RegionKind } from '@/lib/schemas/region';

export type Rect = { x: number; y: number; w: number; h: number };
export type Region = Rect & { kind: RegionKind; source: 'marked' | 'detected' | 'template' };
export type Point = { x: number; y: number };
export type Corner = 'nw' | 'ne' | 'sw' | 'se';
/** Where the drawing sits on the screen (a DOMRect's fields). */
export type Box = { left: number; top: number; width: number; height: number };

export const CORNERS: readonly Corner[] = ['nw', 'ne', 'sw', 'se'];

/** A pointer position on the screen in the photo's pixels (fractional; the drawing may be zoomed or scaled). */
export function screenToPhoto(clientX: number, clientY: number, box: Box, W: number, H: number): Point {
  if (box.width <= 0 || box.height <= 0) return { x: 0, y: 0 };
  return { x: ((clientX - box.left) / box.width) * W, y: ((clientY - box.top) / box.height) * H };
}

/** A photo pixel position on the screen. */
export function photoToScreen(p: Point, box: Box, W: number, H: number): Point {
  return { x: box.left + (p.x / W) * box.width, y: box.top + (p.y / H) * box.height };
}

/** Whole pixels, at least 1 × 1, inside the W × H photo (a rectangle too large shrinks to fit, then moves in). */
export function clampRect<T extends Rect>(r: T, W: number, H: number): T {
  const w = Math.max(1, Math.min(W, Math.round(r.w)));
  const h = Math.max(1, Math.min(H, Math.round(r.h)));
  return { ...r, x: Math.max(0, Math.min(W - w, Math.round(r.x))), y: Math.max(0, Math.min(H - h, Math.round(r.y))), w, h };
}

/** Side of a corner handle and width of a stroke, in photo pixels: constant on screen for photos up to 1600 px wide, growing beyond. */
export function handleSize(W: number): number {
  return 12 * Math.max(1, W / 1600);
}
export function strokeWidth(W: number): number {
  return 2 * Math.max(1, W / 1600);
}

export function cornerPoint(r: Rect, c: Corner): Point {
  return { x: c.endsWith('w') ? r.x : r.x + r.w, y: c.startsWith('n') ? r.y : r.y + r.h };
}

export type Hit = { mode: 'draw' | 'move' | 'resize'; kind: RegionKind; corner?: Corner };

/**
 * What a press at `p` grabs: a corner handle of the active region (handles are drawn only on it),
 * else the topmost region under the point (the active one first, since it is drawn emphasised),
 * else nothing, which starts drawing the active kind.
 */
export function hitTest(regions: readonly Region[], p: Point, active: RegionKind, handle: number): Hit {
  const sel = regions.find((r) => r.kind === active);
  if (sel) {
    for (const c of CORNERS) {
      const q = cornerPoint(sel, c);
      if (Math.abs(p.x - q.x) <= handle / 2 && Math.abs(p.y - q.y) <= handle / 2) return { mode: 'resize', kind: active, corner: c };
    }
  }
  const inside = (r: Rect) => p.x >= r.x && p.x <= r.x + r.w && p.y >= r.y && p.y <= r.y + r.h;
  if (sel && inside(sel)) return { mode: 'move', kind: active };
  // later regions are drawn over earlier ones
  for (let k = regions.length - 1; k >= 0; k--) {
    const r = regions[k] as Region;
    if (inside(r)) return { mode: 'move', kind: r.kind };
  }
  return { mode: 'draw', kind: active };
}

export type Drag = Hit & { start: Point; orig: Region | null };

/**
 * The region a drag from `d.start` to `p` makes, before clamping: a new rectangle spanning the two
 * points, the original moved by the pointer's travel, or the original with the grabbed corner
 * following the pointer (never narrower than 1 px; the opposite corner stays). Null when a move or
 * resize has nothing to act on.
 */
export function dragRegion(d: Drag, p: Point): Region | null {
  const dx = p.x - d.start.x;
  const dy = p.y - d.start.y;
  if (d.mode === 'draw') return { kind: d.kind, x: Math.min(d.start.x, p.x), y: Math.min(d.start.y, p.y), w: Math.abs(dx), h: Math.abs(dy), source: 'marked' };
  const o = d.orig;
  if (!o) return null;
  if (d.mode === 'move') return { ...o, x: o.x + dx, y: o.y + dy, source: 'marked' };
  const left = d.corner === 'nw' || d.corner === 'sw';
  const top = d.corner === 'nw' || d.corner === 'ne';
  const x0 = left ? Math.min(o.x + dx, o.x + o.w - 1) : o.x;
  const y0 = top ? Math.min(o.y + dy, o.y + o.h - 1) : o.y;
  const x1 = left ? o.x + o.w : Math.max(o.x + 1, o.x + o.w + dx);
  const y1 = top ? o.y + o.h : Math.max(o.y + 1, o.y + o.h + dy);
  return { ...o, x: x0, y: y0, w: x1 - x0, h: y1 - y0, source: 'marked' };
}

const ARROWS: Record<string, [number, number]> = { ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, -1], ArrowDown: [0, 1] };

/** An arrow key moves the region by 1 px (Shift: 10); with Alt it changes the size instead. Null for other keys. */
export function nudgeRegion(r: Region, key: string, o: { shift: boolean; alt: boolean }): Region | null {
  const v = ARROWS[key];
  if (!v) return null;
  const step = o.shift ? 10 : 1;
  return o.alt ? { ...r, w: r.w + v[0] * step, h: r.h + v[1] * step, source: 'marked' } : { ...r, x: r.x + v[0] * step, y: r.y + v[1] * step, source: 'marked' };
}

/** Replaces the region of the same kind, clamped to the photo. */
export function putRegion(all: readonly Region[], r: Region, W: number, H: number): Region[] {
  return [...all.filter((x) => x.kind !== r.kind), clampRect(r, W, H)];
}

/**
 * The detected ghost as a rectangle on the photo: the screen translated by the ghost's offset
 * (ghost position minus screen position), cut to the photo. Null when nothing of it is inside.
 * Offsets may be fractional (registration and ghost offsets come to 0.1 px).
 */
export function ghostRect(screen: Rect, offset: { dx: number; dy: number }, W: number, H: number): Rect | null {
  const x0 = Math.max(0, screen.x + offset.dx);
  const y0 = Math.max(0, screen.y + offset.dy);
  const x1 = Math.min(W, screen.x + offset.dx + screen.w);
  const y1 = Math.min(H, screen.y + offset.dy + screen.h);
  if (x1 <= x0 || y1 <= y0) return null;
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}
