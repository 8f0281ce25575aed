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
 * Where the step in `rect` lies, read across it (rows when `alongX`, else columns): with `rising`,
 * the strip goes from outside to inside and the answer is the first inside line; otherwise it goes
 * from inside to outside and the answer is one past the last inside line. Both are offsets from
 * the strip's start, or null without a clean strip or a clear step.
 */
function stepIn(on: EdgeSource, off: EdgeSource, rect: Rect, alongX: boolean, rising: boolean, factor: number): number | null {
  const p = meanAcross(on, off, rect, alongX);
  if (!p) return null;
  const i = crossing(rising ? p : p.slice().reverse(), factor);
  if (i < 0) return null;
  return rising ? i : p.length - i;
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
  const midX = { x: screen.x + Math.floor(screen.w / 4), w: Math.max(1, Math.floor(screen.w / 2)) };
  const midY = { y: screen.y + Math.floor(screen.h / 4), h: Math.max(1, Math.floor(screen.h / 2)) };
  // each strip starts `reach` before the detected edge; top and left rise into the screen, bottom and right fall out of it
  const edge = (at: number, strip: Rect, alongX: boolean, rising: boolean): number => {
    const k = stepIn(on, off, strip, alongX, rising, factor);
    return k === null ? at : at - reach + k;
  };
  const top = edge(screen.y, { ...midX, y: screen.y - reach, h: 2 * reach }, true, true);
  const bottom = edge(screen.y + screen.h, { ...midX, y: screen.y + screen.h - reach, h: 2 * reach }, true, false);
  const left = edge(screen.x, { ...midY, x: screen.x - reach, w: 2 * reach }, false, true);
  const right = edge(screen.x + screen.w, { ...midY, x: screen.x + screen.w - reach, w: 2 * reach }, false, false);
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
  // the middle half of the span [a, b) (where the ghost lies beside the screen), or null
  const middle = (a: number, b: number): [number, number] | null => {
    const len = b - a;
    if (len < 4) return null;
    return [a + Math.floor(len / 4), Math.floor(len / 2)];
  };
  // beyond a positive offset the ghost's far edge falls out of it; before a negative one its near edge rises into it
  const component = (d: number, screenStart: number, screenEnd: number, strip: (start: number) => Rect | null, alongX: boolean): number => {
    if (Math.abs(d) <= reach + 2) return d;
    const edgeAt = d > 0 ? screenEnd + d : screenStart + d;
    const rect = strip(edgeAt - reach);
    const k = rect ? stepIn(on, off, rect, alongX, d < 0, factor) : null;
    return k === null ? d : edgeAt - reach + k - (d > 0 ? screenEnd : screenStart);
  };
  const rows = middle(Math.max(screen.y, screen.y + offset.dy), Math.min(screen.y + screen.h, screen.y + screen.h + offset.dy));
  const cols = middle(Math.max(screen.x, screen.x + offset.dx), Math.min(screen.x + screen.w, screen.x + screen.w + offset.dx));
  const dx = component(offset.dx, screen.x, screen.x + screen.w, (x) => (rows ? { x, y: rows[0], w: 2 * reach, h: rows[1] } : null), false);
  const dy = component(offset.dy, screen.y, screen.y + screen.h, (y) => (cols ? { x: cols[0], y, w: cols[1], h: 2 * reach } : null), true);
  return { dx, dy };
}
