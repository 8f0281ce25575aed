/**
 * The region editor's logic as plain functions: scaling between the screen and the photo's
 * full-resolution pixels, what a press does with the chosen tool (and the hint that says so),
 * drawing, moving and resizing by drag, keyboard steps, clamping to the photo, typed x/y/w/h, the
 * colours and dash patterns of each kind, and the detected ghost's rectangle. The component only
 * wires them to pointer and key events.
 */
import type { RegionKind } from '@/lib/schemas/region';

export type Rect = { x: number; y: number; w: number; h: number };
export type Region = Rect & { kind: RegionKind; source: 'marked' | 'detected' | 'template' };
export type Point = { x: number; y: number };
export type Corner = 'nw' | 'ne' | 'sw' | 'se';
/** Where the drawing sits on the screen (a DOMRect's fields). */
export type Box = { left: number; top: number; width: number; height: number };

export const CORNERS: readonly Corner[] = ['nw', 'ne', 'sw', 'se'];
const KINDS: readonly RegionKind[] = ['screen', 'background', 'ghost'];

/**
 * The editor's tools. A kind's tool draws that kind anywhere, also over another rectangle, and
 * moves or resizes only its own rectangle; Select moves or resizes whichever rectangle is under
 * the pointer and never draws.
 */
export type Tool = RegionKind | 'select';
export const TOOLS: readonly Tool[] = ['select', 'screen', 'background', 'ghost'];

/**
 * How each kind is drawn: colours of the Okabe–Ito palette (Okabe & Ito, "Color Universal
 * Design", 2008: common practice), the three that stay furthest apart under protan, deutan and
 * tritan vision, plus a dash pattern of its own and a text label, so no reader depends on hue alone.
 */
export const REGION_STYLE: Record<RegionKind, { name: string; colour: string; colourName: string; pattern: 'solid' | 'dashed' | 'dotted' }> = {
  screen: { name: 'Screen', colour: '#56B4E9', colourName: 'sky blue', pattern: 'solid' },
  background: { name: 'Background', colour: '#F0E442', colourName: 'yellow', pattern: 'dashed' },
  ghost: { name: 'Ghost', colour: '#D55E00', colourName: 'vermillion', pattern: 'dotted' },
};

/** The SVG stroke-dasharray of a pattern for a stroke of `stroke` units (undefined: solid). */
export function dashArray(pattern: 'solid' | 'dashed' | 'dotted', stroke: number): string | undefined {
  if (pattern === 'dashed') return `${stroke * 6} ${stroke * 3}`;
  if (pattern === 'dotted') return `${stroke} ${stroke * 2}`;
  return undefined;
}

/** A pointer position on the screen in the photo's pixels (fractional; the drawing may be zoomed or scaled). */
export function screenToPhoto(clientX: number, clientY: number, box: Box, W: number, H: number): Point {
  if (box.width <= 0 || box.height <= 0) return { x: 0, y: 0 };
  return { x: ((clientX - box.left) / box.width) * W, y: ((clientY - box.top) / box.height) * H };
}

/** A photo pixel position on the screen. */
export function photoToScreen(p: Point, box: Box, W: number, H: number): Point {
  return { x: box.left + (p.x / W) * box.width, y: box.top + (p.y / H) * box.height };
}

/**
 * For a move: whole pixels, at least 1 × 1, inside the W × H photo; a rectangle too large shrinks
 * to fit, then the whole rectangle slides in (its size is kept).
 */
export function clampRect<T extends Rect>(r: T, W: number, H: number): T {
  const w = Math.max(1, Math.min(W, Math.round(r.w)));
  const h = Math.max(1, Math.min(H, Math.round(r.h)));
  return { ...r, x: Math.max(0, Math.min(W - w, Math.round(r.x))), y: Math.max(0, Math.min(H - h, Math.round(r.y))), w, h };
}

/**
 * For drawing and resizing: the rectangle cut to the photo, each edge rounded to a whole pixel on
 * its own, at least 1 × 1. An edge dragged past the photo stops at its border and the opposite
 * edge stays where it was (a move would shift it instead).
 */
export function cropRect<T extends Rect>(r: T, W: number, H: number): T {
  const x0 = Math.max(0, Math.min(W - 1, Math.round(r.x)));
  const y0 = Math.max(0, Math.min(H - 1, Math.round(r.y)));
  const x1 = Math.max(x0 + 1, Math.min(W, Math.round(r.x + r.w)));
  const y1 = Math.max(y0 + 1, Math.min(H, Math.round(r.y + r.h)));
  return { ...r, x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

/** Side of a corner handle and width of a stroke, in photo pixels: constant on screen for photos up to 1600 px wide, growing beyond. */
export function handleSize(W: number): number {
  return 12 * Math.max(1, W / 1600);
}
export function strokeWidth(W: number): number {
  return 2 * Math.max(1, W / 1600);
}

/**
 * Handle side, stroke width and label size in photo pixels, chosen so they look the same on
 * screen (14, 2 and 12 screen pixels) whatever the photo's size, the page's width and the zoom.
 * `shownWidth` is the drawing's width on screen; before it is measured (0) the fixed sizes above
 * stand in.
 */
export function drawingUnits(W: number, shownWidth: number): { handle: number; stroke: number; font: number } {
  if (!(shownWidth > 0)) return { handle: handleSize(W), stroke: strokeWidth(W), font: strokeWidth(W) * 6 };
  const perPx = W / shownWidth;
  return { handle: 14 * perPx, stroke: 2 * perPx, font: 12 * perPx };
}

export function cornerPoint(r: Rect, c: Corner): Point {
  return { x: c.endsWith('w') ? r.x : r.x + r.w, y: c.startsWith('n') ? r.y : r.y + r.h };
}

/** The rectangle a tool acts on: its own kind's, or under Select the selected one. */
export function toolTarget(tool: Tool, selected: RegionKind | null): RegionKind | null {
  return tool === 'select' ? selected : tool;
}

export type Hit = { mode: 'draw' | 'move' | 'resize'; kind: RegionKind; corner?: Corner } | { mode: 'none'; kind: null };

const inside = (r: Rect, p: Point) => p.x >= r.x && p.x <= r.x + r.w && p.y >= r.y && p.y <= r.y + r.h;

/**
 * What a press at `p` does with `tool` chosen. The tool's own rectangle (under Select, the
 * selected one) answers first: a corner handle (drawn only on it) resizes it, its inside moves it.
 * Elsewhere, also inside another kind's rectangle, a kind's tool draws a new rectangle of its kind;
 * Select grabs the topmost rectangle under the pointer to move it, or nothing.
 */
export function hitTest(regions: readonly Region[], p: Point, tool: Tool, handle: number, selected: RegionKind | null = null): Hit {
  const target = toolTarget(tool, selected);
  const own = target ? regions.find((r) => r.kind === target) : undefined;
  if (own) {
    for (const c of CORNERS) {
      const q = cornerPoint(own, c);
      if (Math.abs(p.x - q.x) <= handle / 2 && Math.abs(p.y - q.y) <= handle / 2) return { mode: 'resize', kind: own.kind, corner: c };
    }
    if (inside(own, p)) return { mode: 'move', kind: own.kind };
  }
  if (tool !== 'select') return { mode: 'draw', kind: tool };
  // later regions are drawn over earlier ones
  for (let k = regions.length - 1; k >= 0; k--) {
    const r = regions[k] as Region;
    if (inside(r, p)) return { mode: 'move', kind: r.kind };
  }
  return { mode: 'none', kind: null };
}

const CORNER_TEXT: Record<Corner, string> = { nw: 'top-left', ne: 'top-right', sw: 'bottom-left', se: 'bottom-right' };

/** The sentence shown while the pointer is over the photo: what a drag starting there does. */
export function dragHint(hit: Hit, regions: readonly Region[]): string {
  if (hit.mode === 'none') return 'Drag a rectangle to move it. To draw one, pick Screen, Background or Ghost.';
  const name = REGION_STYLE[hit.kind].name.toLowerCase();
  if (hit.mode === 'resize') return `Drag to resize the ${name} from its ${CORNER_TEXT[hit.corner as Corner]} corner.`;
  if (hit.mode === 'move') return `Drag to move the ${name}.`;
  return regions.some((r) => r.kind === hit.kind) ? `Drag to draw a new ${name} rectangle (it replaces the marked ${name}).` : `Drag to draw the ${name} rectangle.`;
}

/** The pointer's shape over a spot, matching what a drag does there. */
export function cursorFor(hit: Hit): string {
  if (hit.mode === 'draw') return 'crosshair';
  if (hit.mode === 'move') return 'move';
  if (hit.mode === 'resize') return hit.corner === 'nw' || hit.corner === 'se' ? 'nwse-resize' : 'nesw-resize';
  return 'default';
}

export type Drag = Hit & { start: Point; orig: Region | null };

/**
 * The region a drag from `d.start` to `p` makes, before fitting to the photo: a new rectangle
 * spanning the two points, the original moved by the pointer's travel, or the original with the
 * grabbed corner following the pointer (never narrower than 1 px; the opposite corner stays).
 * Null when there is nothing to act on, and for a drawing whose travel is under `minDraw` photo
 * pixels on both axes (a click or a shaking hand, which must not replace a rectangle with a speck).
 */
export function dragRegion(d: Drag, p: Point, minDraw = 0): Region | null {
  if (d.mode === 'none') return null;
  const dx = p.x - d.start.x;
  const dy = p.y - d.start.y;
  if (d.mode === 'draw') {
    if (Math.abs(dx) < minDraw && Math.abs(dy) < minDraw) return null;
    return { kind: d.kind, x: Math.min(d.start.x, p.x), y: Math.min(d.start.y, p.y), w: Math.abs(dx), h: Math.abs(dy), source: 'marked' };
  }
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

/**
 * All regions while a drag is at `p`: the dragged kind replaced by what the drag makes, fitted to
 * the photo (a move slides in whole, a drawing or resize is cut at the border); a drawing too
 * small so far leaves the kind as it was before the drag. Other kinds never change.
 */
export function applyDrag(all: readonly Region[], d: Drag, p: Point, W: number, H: number, minDraw = 0): Region[] {
  if (d.mode === 'none') return [...all];
  const next = dragRegion(d, p, minDraw);
  const others = all.filter((r) => r.kind !== d.kind);
  if (!next) return d.orig ? [...others, d.orig] : d.mode === 'draw' ? others : [...all];
  return [...others, d.mode === 'move' ? clampRect(next, W, H) : cropRect(next, W, H)];
}

/** Replaces the region of the same kind, fitted to the photo (moved in whole, or cut for a resize). */
export function putRegion(all: readonly Region[], r: Region, W: number, H: number, fit: 'move' | 'crop' = 'move'): Region[] {
  return [...all.filter((x) => x.kind !== r.kind), fit === 'move' ? clampRect(r, W, H) : cropRect(r, W, H)];
}

// ---------------------------------------------------------------------------------------------
// Keyboard

/** What the arrow keys do to the selected rectangle. */
export type KeyMode = 'move' | 'resize';
export type KeyMods = { shift: boolean; alt: boolean };

/** Steps that suit photos from a phone to a 24 MP camera: 1 px, Shift 10 px, Alt (⌥ on a Mac) 100 px. */
export function keyStep(m: KeyMods): number {
  return m.alt ? 100 : m.shift ? 10 : 1;
}

/** What the keys do, as the hint under the photo says it; keep in step with `keyStep` and `keyAction`. */
export const KEY_HINT = 'Arrow keys move the selected rectangle by 1 px, with Shift by 10 px, with Alt (⌥) by 100 px. R switches the arrows between moving and resizing (→ and ↓ grow it, ← and ↑ shrink it). Esc cancels a drag.';

const ARROWS: Record<string, [number, number]> = { ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, -1], ArrowDown: [0, 1] };

/**
 * An arrow key's change to the region: moved by the step, or in resize mode its right or bottom
 * edge moved by the step (the top-left corner stays, never under 1 px). Null for other keys.
 */
export function nudgeRegion(r: Region, key: string, m: KeyMods, mode: KeyMode = 'move'): Region | null {
  const v = ARROWS[key];
  if (!v) return null;
  const step = keyStep(m);
  if (mode === 'resize') return { ...r, w: Math.max(1, r.w + v[0] * step), h: Math.max(1, r.h + v[1] * step), source: 'marked' };
  return { ...r, x: r.x + v[0] * step, y: r.y + v[1] * step, source: 'marked' };
}

export type KeyAction = { type: 'nudge'; region: Region } | { type: 'toggle-mode' } | { type: 'cancel' } | null;

/**
 * What a key pressed on the photo does. Arrows change the selected region (fitted to the photo:
 * a move stops at the border with its size kept, a resize stops the edge at the border); R toggles
 * moving and resizing; Escape cancels a drag. Ctrl and ⌘ combinations are left to the browser.
 */
export function keyAction(e: { key: string; shiftKey: boolean; altKey: boolean; ctrlKey: boolean; metaKey: boolean }, selected: Region | null, mode: KeyMode, W: number, H: number): KeyAction {
  if (e.ctrlKey || e.metaKey) return null;
  if (e.key === 'Escape') return { type: 'cancel' };
  if ((e.key === 'r' || e.key === 'R') && !e.altKey) return { type: 'toggle-mode' };
  if (!selected) return null;
  const next = nudgeRegion(selected, e.key, { shift: e.shiftKey, alt: e.altKey }, mode);
  if (!next) return null;
  return { type: 'nudge', region: mode === 'move' ? clampRect(next, W, H) : cropRect(next, W, H) };
}

// ---------------------------------------------------------------------------------------------
// Typed x, y, w, h

export type RectField = 'x' | 'y' | 'w' | 'h';
export type RectDraft = Record<RectField, string>;
export const RECT_FIELDS: readonly RectField[] = ['x', 'y', 'w', 'h'];

/** The text fields of a rectangle (empty for a kind not marked). */
export function draftOf(r: Rect | null): RectDraft {
  return r ? { x: String(r.x), y: String(r.y), w: String(r.w), h: String(r.h) } : { x: '', y: '', w: '', h: '' };
}

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function wholePixels(s: string): { ok: true; v: number } | { ok: false; error: string } {
  const t = s.trim();
  if (t === '') return { ok: false, error: 'Enter a number of pixels' };
  if (!DECIMAL.test(t)) return { ok: false, error: `“${t.slice(0, 20)}” is not a number of pixels` };
  const v = Number(t);
  if (!Number.isInteger(v)) return { ok: false, error: `Whole pixels only: ${t} is not a whole number` };
  return { ok: true, v };
}

export type DraftCheck = { ok: true; rect: Rect } | { ok: false; errors: Partial<Record<RectField, string>> };

/**
 * Typed values checked against the W × H photo: whole pixels, the corner inside the photo, at
 * least 1 × 1, and the far edges no further than the photo's. Each message names the allowed range.
 */
export function checkDraft(d: RectDraft, W: number, H: number): DraftCheck {
  const errors: Partial<Record<RectField, string>> = {};
  const v: Partial<Record<RectField, number>> = {};
  for (const f of RECT_FIELDS) {
    const p = wholePixels(d[f]);
    if (p.ok) v[f] = p.v;
    else errors[f] = p.error;
  }
  const { x, y, w, h } = v;
  if (x !== undefined && (x < 0 || x > W - 1)) errors.x = `x runs from 0 to ${W - 1} (the photo is ${W} px wide)`;
  if (y !== undefined && (y < 0 || y > H - 1)) errors.y = `y runs from 0 to ${H - 1} (the photo is ${H} px tall)`;
  const xOk = x !== undefined && !errors.x;
  const yOk = y !== undefined && !errors.y;
  if (w !== undefined && w < 1) errors.w = 'The width is at least 1 px';
  else if (w !== undefined && xOk && x + w > W) errors.w = `x + w is ${x + w} px, past the photo’s right edge at ${W} px: at most ${W - x} px at x ${x}`;
  else if (w !== undefined && !xOk && w > W) errors.w = `The width is at most ${W} px`;
  if (h !== undefined && h < 1) errors.h = 'The height is at least 1 px';
  else if (h !== undefined && yOk && y + h > H) errors.h = `y + h is ${y + h} px, past the photo’s bottom edge at ${H} px: at most ${H - y} px at y ${y}`;
  else if (h !== undefined && !yOk && h > H) errors.h = `The height is at most ${H} px`;
  if (Object.keys(errors).length) return { ok: false, errors };
  return { ok: true, rect: { x: x as number, y: y as number, w: w as number, h: h as number } };
}

/** True when the typed values differ from the region they were made from (an edit not yet applied). */
export function draftChanged(d: RectDraft, r: Rect | null): boolean {
  const base = draftOf(r);
  return RECT_FIELDS.some((f) => d[f].trim() !== base[f]);
}

// ---------------------------------------------------------------------------------------------
// Saving

/** Whether two region lists hold the same rectangles (kind, place, size and source), in any order. */
export function sameRegions(a: readonly Region[], b: readonly Region[]): boolean {
  if (a.length !== b.length) return false;
  return KINDS.every((k) => {
    const p = a.find((r) => r.kind === k);
    const q = b.find((r) => r.kind === k);
    if (!p || !q) return !p && !q;
    return p.x === q.x && p.y === q.y && p.w === q.w && p.h === q.h && p.source === q.source;
  });
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
