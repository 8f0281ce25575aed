import { luminanceCrop } from './crop';
import { translation, type Motion } from './motion';
import type { Offset, PhotoRaster, Rect } from './types';
import { warpedCrop } from './warp';

/** One photo as the refinement reads it: pixels, alignment onto the on photo, exposure scale. */
export interface EdgeSource {
  raster: PhotoRaster;
  /** Whole-pixel alignment (the photo's features minus the on photo's); `motion` wins when given. */
  offset: Offset;
  /** Sub-pixel alignment with rotation. */
  motion?: Motion;
  scale: number;
}

/** The difference D over a rectangle in on-photo coordinates (NaN where there is no data). */
export type DiffReader = (rect: Rect) => Float32Array;

function cropOf(s: EdgeSource, rect: Rect): Float32Array {
  if (s.motion) return warpedCrop(s.raster, rect, s.motion, s.scale).data;
  if (Number.isInteger(s.offset.dx) && Number.isInteger(s.offset.dy)) return luminanceCrop(s.raster, rect, s.offset, s.scale).plane.data;
  return warpedCrop(s.raster, rect, translation(s.offset, s.raster.width, s.raster.height), s.scale).data;
}

/** D = first − second (or the first alone) read through the sources' alignment. */
export function diffReader(first: EdgeSource, second?: EdgeSource | null): DiffReader {
  return (rect) => {
    const a = cropOf(first, rect);
    if (!second) return a;
    const b = cropOf(second, rect);
    const out = new Float32Array(a.length);
    for (let i = 0; i < a.length; i++) out[i] = (a[i] as number) - (b[i] as number);
    return out;
  };
}

/**
 * The mean of D over `rect`, one value per pixel across the edge: per row when `alongX` (a strip
 * lying along x, read downwards), else per column. Null when the strip leaves the image or a line
 * of it holds no data.
 */
function meanAcross(read: DiffReader, size: { width: number; height: number }, rect: Rect, alongX: boolean): Float64Array | null {
  if (rect.w < 1 || rect.h < 1 || rect.x < 0 || rect.y < 0 || rect.x + rect.w > size.width || rect.y + rect.h > size.height) return null;
  const a = read(rect);
  const n = alongX ? rect.h : rect.w;
  const sums = new Float64Array(n);
  const counts = new Float64Array(n);
  for (let j = 0; j < rect.h; j++) {
    for (let i = 0; i < rect.w; i++) {
      const v = a[j * rect.w + i] as number;
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

/** Outer and inner plateau of a profile read outside → inside: the means of its first and last `reach` values. */
function plateaus(profile: Float64Array, reach: number): { outer: number; inner: number } {
  const n = profile.length;
  let outer = 0;
  let inner = 0;
  for (let i = 0; i < reach; i++) {
    outer += profile[i] as number;
    inner += profile[n - 1 - i] as number;
  }
  return { outer: outer / reach, inner: inner / reach };
}

/**
 * Where `profile` (outside → inside) first reaches `share` of the way from its outer to its inner
 * plateau, as a boundary position in pixels from the profile's start (a sharp step between values
 * i − 1 and i sits at i), or NaN when the step is not clear.
 */
function crossingAt(profile: Float64Array, reach: number, share: number): number {
  const { outer, inner } = plateaus(profile, reach);
  if (!(inner > outer)) return Number.NaN;
  const level = outer + share * (inner - outer);
  for (let i = 0; i < profile.length; i++) {
    const v = profile[i] as number;
    if (v >= level) {
      if (i === 0) return 0;
      const p = profile[i - 1] as number;
      // linear between sample centres i − 1 and i; the boundary sits half a pixel past the crossing's centre
      return i - 1 + (level - p) / (v - p) + 0.5;
    }
  }
  return Number.NaN;
}

interface Edge {
  /** The strip across the edge, read outside → inside. */
  strip: Rect;
  alongX: boolean;
  /** The strip runs inside → outside in image order (bottom and right edges). */
  reversed: boolean;
}

/** Strips of length 2·reach across the four edges of `screen`, over the middle half of each edge. */
function edgeStrips(screen: Rect, reach: number): Record<'top' | 'bottom' | 'left' | 'right', Edge> {
  const midX = { x: screen.x + Math.floor(screen.w / 4), w: Math.max(1, Math.floor(screen.w / 2)) };
  const midY = { y: screen.y + Math.floor(screen.h / 4), h: Math.max(1, Math.floor(screen.h / 2)) };
  return {
    top: { strip: { ...midX, y: screen.y - reach, h: 2 * reach }, alongX: true, reversed: false },
    bottom: { strip: { ...midX, y: screen.y + screen.h - reach, h: 2 * reach }, alongX: true, reversed: true },
    left: { strip: { ...midY, x: screen.x - reach, w: 2 * reach }, alongX: false, reversed: false },
    right: { strip: { ...midY, x: screen.x + screen.w - reach, w: 2 * reach }, alongX: false, reversed: true },
  };
}

function profileOf(read: DiffReader, size: { width: number; height: number }, e: Edge): Float64Array | null {
  const p = meanAcross(read, size, e.strip, e.alongX);
  return p && e.reversed ? p.reverse() : p;
}

/**
 * Where the step in an edge strip lies, as a sub-pixel boundary measured from the strip's start in
 * image order (for a reversed strip, one past the last inside line), or null without a clear step.
 */
function stepAt(read: DiffReader, size: { width: number; height: number }, e: Edge, plateau: number): number | null {
  const p = profileOf(read, size, e);
  if (!p) return null;
  const c = crossingAt(p, plateau, 0.5);
  if (!Number.isFinite(c)) return null;
  return e.reversed ? p.length - c : c;
}

/**
 * The detected screen's edges moved to full resolution. Detection works on blocks of `factor`
 * pixels, so each edge it finds can be off by up to a block. Here, for each edge, the mean of D
 * over the middle half of the edge is read pixel by pixel across ±2 blocks, and the edge is put at
 * the half-way crossing (the edge under any symmetric blur). An edge with no clear step keeps its place.
 */
export function refineScreenEdges(screen: Rect, on: EdgeSource, off: EdgeSource, factor: number): Rect {
  return refineScreenEdgesWith(screen, diffReader(on, off), on.raster, factor);
}

/** refineScreenEdges on any reader of D. */
export function refineScreenEdgesWith(screen: Rect, read: DiffReader, size: { width: number; height: number }, factor: number): Rect {
  if (factor <= 1) return { ...screen };
  const reach = 2 * factor;
  const s = edgeStrips(screen, reach);
  const edge = (at: number, e: Edge): number => {
    const k = stepAt(read, size, e, factor);
    return k === null ? at : Math.round(at - reach + k);
  };
  const top = edge(screen.y, s.top);
  const bottom = edge(screen.y + screen.h, s.bottom);
  const left = edge(screen.x, s.left);
  const right = edge(screen.x + screen.w, s.right);
  if (!(right - left >= 1 && bottom - top >= 1)) return { ...screen };
  return { x: left, y: top, w: right - left, h: bottom - top };
}

/** The screen's edge spread, measured from the edge profiles of D (docs/method.md §5.8). */
export interface EdgeSpread {
  /** 10–90% rise distance of the edge, px (the lower median over the edges with a clear step). */
  width: number;
  /** How far the edge's half-way point lies outside the screen rectangle at most, px (≥ 0). */
  outside: number;
  /** Pixels around the screen (and inside a ghost's border) left out of ghost bands. */
  zone: number;
  /** Edges with a clear step (of 4). */
  edges: number;
}

/** The edge zone is this many 10–90% widths past the edge: 3.8 σ of a Gaussian blur, twice the radius of a defocus disc. */
export const EDGE_ZONE_WIDTHS = 1.5;

/**
 * The screen's edge spread read from D: for each edge, the mean of D over its middle half, pixel by
 * pixel across it, and the distance between its 10% and 90% levels. Blur and defocus spread the
 * screen's light over that distance; the edge zone is EDGE_ZONE_WIDTHS of it past the edge's
 * half-way point (where the light a Gaussian blur leaves outside is below 1e-4 of the screen's).
 * The reach grows until the step fits well inside it.
 */
export function measureEdgeSpread(screen: Rect, read: DiffReader, size: { width: number; height: number }, minReach = 12): EdgeSpread {
  const maxReach = Math.max(minReach, Math.min(256, Math.floor(Math.min(screen.w, screen.h) / 4)));
  let reach = Math.min(maxReach, Math.max(4, minReach));
  for (;;) {
    const widths: number[] = [];
    let outside = 0;
    const strips = edgeStrips(screen, reach);
    const plateau = Math.max(2, Math.floor(reach / 4));
    for (const e of Object.values(strips)) {
      const p = profileOf(read, size, e);
      if (!p) continue;
      const c10 = crossingAt(p, plateau, 0.1);
      const c50 = crossingAt(p, plateau, 0.5);
      const c90 = crossingAt(p, plateau, 0.9);
      if (!Number.isFinite(c10) || !Number.isFinite(c90) || !Number.isFinite(c50)) continue;
      widths.push(Math.max(0, c90 - c10));
      // the strip's boundary with the rectangle is at `reach`; a half-way point before it lies outside
      outside = Math.max(outside, reach - c50);
    }
    widths.sort((a, b) => a - b);
    const width = widths.length === 0 ? 1 : (widths[Math.floor((widths.length - 1) / 2)] as number);
    // a step this wide relative to the strip was cut short: read further out
    if (widths.length > 0 && (width > 0.35 * reach || outside > 0.5 * reach) && reach < maxReach) {
      reach = Math.min(maxReach, reach * 2);
      continue;
    }
    const w = Math.max(1, width);
    return { width, outside, zone: Math.ceil(Math.max(0, outside) + EDGE_ZONE_WIDTHS * w) + 1, edges: widths.length };
  }
}

/**
 * The ghost's offset to a fraction of a pixel. The ghost is a displaced copy of the screen, so
 * beyond the screen's right (or left) edge its own edge stands at screen edge + dx, and below (or
 * above) it at screen edge + dy. Each is read like a screen edge, the half-way crossing of the mean
 * of D along it, across ±reach of the coarse guess, and the screen's own edge the same way on the
 * same side; the component is the distance between the two. A component too close to the screen's
 * edge for a clean strip, with no clear step, or with its step more than `maxMove` from the guess,
 * keeps its coarse value.
 */
export function refineGhostOffsetWith(screen: Rect, offset: Offset, read: DiffReader, size: { width: number; height: number }, reach: number, zone = 0, maxMove = reach): Offset {
  const middle = (a: number, b: number): [number, number] | null => {
    const len = b - a;
    if (len < 4) return null;
    return [a + Math.floor(len / 4), Math.floor(len / 2)];
  };
  const rows = middle(Math.max(screen.y, screen.y + Math.round(offset.dy)), Math.min(screen.y + screen.h, screen.y + screen.h + Math.round(offset.dy)));
  const cols = middle(Math.max(screen.x, screen.x + Math.round(offset.dx)), Math.min(screen.x + screen.w, screen.x + screen.w + Math.round(offset.dx)));
  const plateau = Math.max(2, Math.floor(reach / 2));
  const strip = (at: number, alongX: boolean, span: [number, number], reversed: boolean): Edge => {
    const s0 = Math.round(at) - reach;
    const rect: Rect = alongX ? { x: span[0], y: s0, w: span[1], h: 2 * reach } : { x: s0, y: span[0], w: 2 * reach, h: span[1] };
    return { strip: rect, alongX, reversed };
  };
  const edgeAt = (e: Edge): number | null => {
    const k = stepAt(read, size, e, plateau);
    return k === null ? null : (e.alongX ? e.strip.y : e.strip.x) + k;
  };
  // The ghost's far edge along one axis is read where nothing else is: in the ghost's part beside
  // the screen (past the screen's side and its edge zone) when there is one at least 4 px wide,
  // else over the screen's span when the edge is far enough from the screen's own edge.
  const beside = (d: number, otherD: number, otherStart: number, otherEnd: number): [number, number] | null => {
    const o = Math.round(otherD);
    const a = o > 0 ? otherEnd + zone : otherStart + o;
    const b = o > 0 ? otherEnd + o : otherStart - zone;
    return middle(a, b) ?? (b - a >= 4 ? [a, b - a] : null);
  };
  const component = (d: number, start: number, end: number, alongX: boolean, span: [number, number] | null, side: [number, number] | null): number => {
    if (Math.abs(d) < 1) return d;
    const reversed = d > 0;
    // beyond a positive offset the ghost's far edge falls out of it, as the screen's own edge on that side
    const screenEdge = d > 0 ? end : start;
    const useSide = side !== null && span !== null;
    if (!useSide && (!span || Math.abs(d) <= reach + zone + 2)) return d;
    const sAt = span ? edgeAt(strip(screenEdge, alongX, span, reversed)) : null;
    const gAt = edgeAt(strip(screenEdge + d, alongX, (useSide ? side : span) as [number, number], reversed));
    if (sAt === null || gAt === null) return d;
    const found = gAt - sAt;
    // a step further off than the guess's own uncertainty is another edge (a pattern's, the room's)
    return Math.abs(found - d) <= maxMove ? found : d;
  };
  const dx = component(offset.dx, screen.x, screen.x + screen.w, false, rows, beside(offset.dx, offset.dy, screen.y, screen.y + screen.h));
  const dy = component(offset.dy, screen.y, screen.y + screen.h, true, cols, beside(offset.dy, offset.dx, screen.x, screen.x + screen.w));
  return { dx, dy };
}

/** The ghost offset put to the pixel from the ghost's own edges, with on and off photos at hand. */
export function refineGhostOffset(screen: Rect, offset: Offset, on: EdgeSource, off: EdgeSource, factor: number): Offset {
  if (factor <= 1) return { ...offset };
  const o = refineGhostOffsetWith(screen, offset, diffReader(on, off), on.raster, 2 * factor);
  return { dx: Math.round(o.dx), dy: Math.round(o.dy) };
}
