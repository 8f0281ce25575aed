import { luminanceCrop } from './crop';
import type { Offset, PhotoRaster, Rect } from './types';

/** One photo as the refinement reads it: pixels, alignment onto the on photo, exposure scale. */
export interface EdgeSource {
  raster: PhotoRaster;
  offset: Offset;
  scale: number;
}

/**
 * Index of the first of `profile`'s values past the half-way level between its outer and inner
 * ends (reading outside → inside), or −1 when the step is not clear. The half-way crossing is the
 * usual definition of an edge under blur.
 */
function crossing(profile: Float64Array, reach: number): number {
  const n = profile.length;
  let outer = 0;
  let inner = 0;
  for (let i = 0; i < reach; i++) {
    outer += profile[i] as number;
    inner += profile[n - 1 - i] as number;
  }
  outer /= reach;
  inner /= reach;
  if (!(inner > outer)) return -1;
  const half = (outer + inner) / 2;
  for (let i = 0; i < n; i++) if ((profile[i] as number) >= half) return i;
  return -1;
}

/**
 * The mean of D = on − off over `rect`, one value per pixel across the edge: per row when `alongX`
 * (a strip lying along x, read downwards), else per column. Null when the strip leaves the image
 * or a line of it holds no pixel of both photos.
 */
function meanAcross(on: EdgeSource, off: EdgeSource, rect: Rect, alongX: boolean): Float64Array | null {
  const { width: W, height: H } = on.raster;
  if (rect.w < 1 || rect.h < 1 || rect.x < 0 || rect.y < 0 || rect.x + rect.w > W || rect.y + rect.h > H) return null;
  const a = luminanceCrop(on.raster, rect, on.offset, on.scale).plane.data;
  const b = luminanceCrop(off.raster, rect, off.offset, off.scale).plane.data;
  const n = alongX ? rect.h : rect.w;
  const sums = new Float64Array(n);
  const counts = new Float64Array(n);
  for (let j = 0; j < rect.h; j++) {
    for (let i = 0; i < rect.w; i++) {
      const v = (a[j * rect.w + i] as number) - (b[j * rect.w + i] as number);
      if (v !== v) continue;
      const k = alongX ? j : i;
      sums[k] = (sums[k] as number) + v;
      counts[k] = (counts[k] as number) + 1;
    }
  }
  for (let k = 0; k < n; k++) {
    if (!((counts[k] as number) > 0)) return null;
    sums[k] = (sums[k] as number) / (counts[k] as number);
  }
  return sums;
}

/**
 * The detected screen's edges moved to full resolution. Detection works on blocks of `factor`
 * pixels, so each edge it finds can be off by up to a block; a block straddling the edge is then
 * left out or taken in. Here, for each edge, the mean of D = on − off over the middle half of the
 * edge is read pixel by pixel across ±2 blocks, and the edge is put at the half-way crossing.
 * An edge whose profile shows no clear step keeps its detected place.
 */
export function refineScreenEdges(screen: Rect, on: EdgeSource, off: EdgeSource, factor: number): Rect {
  if (factor <= 1) return { ...screen };
  const reach = 2 * factor;
  const profileAcross = (strip: Rect, alongX: boolean) => meanAcross(on, off, strip, alongX);
  const midX = { x: screen.x + Math.floor(screen.w / 4), w: Math.max(1, Math.floor(screen.w / 2)) };
  const midY = { y: screen.y + Math.floor(screen.h / 4), h: Math.max(1, Math.floor(screen.h / 2)) };
  let top = screen.y;
  let bottom = screen.y + screen.h;
  let left = screen.x;
  let right = screen.x + screen.w;
  // top: rows from above the edge downwards
  const t = profileAcross({ ...midX, y: screen.y - reach, h: 2 * reach }, true);
  if (t) {
    const i = crossing(t, factor);
    if (i >= 0) top = screen.y - reach + i;
  }
  // bottom: rows from below the edge upwards
  const bRaw = profileAcross({ ...midX, y: screen.y + screen.h - reach, h: 2 * reach }, true);
  if (bRaw) {
    const i = crossing(bRaw.slice().reverse(), factor);
    if (i >= 0) bottom = screen.y + screen.h + reach - i;
  }
  const l = profileAcross({ ...midY, x: screen.x - reach, w: 2 * reach }, false);
  if (l) {
    const i = crossing(l, factor);
    if (i >= 0) left = screen.x - reach + i;
  }
  const rRaw = profileAcross({ ...midY, x: screen.x + screen.w - reach, w: 2 * reach }, false);
  if (rRaw) {
    const i = crossing(rRaw.slice().reverse(), factor);
    if (i >= 0) right = screen.x + screen.w + reach - i;
  }
  if (!(right - left >= 1 && bottom - top >= 1)) return { ...screen };
  return { x: left, y: top, w: right - left, h: bottom - top };
}

/**
 * The ghost's offset moved to full resolution. The ghost is a displaced copy of the screen, so
 * beyond the screen's right (or left) edge its own edge stands at screen edge + dx, and below (or
 * above) it at screen edge + dy. Each is read like a screen edge: the mean of D along the edge,
 * pixel by pixel across ±2 blocks of the coarse guess, put at the half-way crossing. A component
 * too close to the screen's edge for a clean strip, or with no clear step, keeps its coarse value.
 */
export function refineGhostOffset(screen: Rect, offset: Offset, on: EdgeSource, off: EdgeSource, factor: number): Offset {
  if (factor <= 1) return { ...offset };
  const reach = 2 * factor;
  const strip = (rect: Rect, alongX: boolean) => meanAcross(on, off, rect, alongX);
  // the middle half of the span [a, b) (where the ghost lies beside the screen), or null
  const middle = (a: number, b: number): [number, number] | null => {
    const len = b - a;
    if (len < 4) return null;
    return [a + Math.floor(len / 4), Math.floor(len / 2)];
  };
  let { dx, dy } = offset;
  if (Math.abs(offset.dx) > reach + 2) {
    const rows = middle(Math.max(screen.y, screen.y + offset.dy), Math.min(screen.y + screen.h, screen.y + screen.h + offset.dy));
    if (rows) {
      const [y, h] = rows;
      if (offset.dx > 0) {
        const x0 = screen.x + screen.w + offset.dx - reach;
        const p = strip({ x: x0, y, w: 2 * reach, h }, false);
        const i = p ? crossing(p.slice().reverse(), factor) : -1;
        if (i >= 0) dx = x0 + 2 * reach - i - (screen.x + screen.w);
      } else {
        const x0 = screen.x + offset.dx - reach;
        const p = strip({ x: x0, y, w: 2 * reach, h }, false);
        const i = p ? crossing(p, factor) : -1;
        if (i >= 0) dx = x0 + i - screen.x;
      }
    }
  }
  if (Math.abs(offset.dy) > reach + 2) {
    const cols = middle(Math.max(screen.x, screen.x + offset.dx), Math.min(screen.x + screen.w, screen.x + screen.w + offset.dx));
    if (cols) {
      const [x, w] = cols;
      if (offset.dy > 0) {
        const y0 = screen.y + screen.h + offset.dy - reach;
        const p = strip({ x, y: y0, w, h: 2 * reach }, true);
        const i = p ? crossing(p.slice().reverse(), factor) : -1;
        if (i >= 0) dy = y0 + 2 * reach - i - (screen.y + screen.h);
      } else {
        const y0 = screen.y + offset.dy - reach;
        const p = strip({ x, y: y0, w, h: 2 * reach }, true);
        const i = p ? crossing(p, factor) : -1;
        if (i >= 0) dy = y0 + i - screen.y;
      }
    }
  }
  return { dx, dy };
}
