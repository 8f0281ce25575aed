import { displayColourOf, sampledRgbMeans, type Chromaticity, type RgbMean } from '../display-colour';
import { EngineInputError } from '../errors';
import { focalLengthPx, screenGeometry, DEGREES_PER_PIXEL_BOUNDS } from '../geometry';
import { roundedOffsetIn, scaleMotion, type Motion } from '../motion';
import { percentile } from '../percentile';
import { gridCells } from '../rect';
import type { CaptureResult, EngineWarning } from '../result';
import { diffReader, type DiffReader } from '../screen-edges';
import { curveOf, meanMtf, slantedEdgeMtf, transposePlane, MIN_HALF_WIDTH, type EdgeMtf } from '../sharpness';
import type { Offset, Pattern, Plane, PhotoRole, Rect } from '../types';
import { warpPlane } from '../warp';
import { sourceOf, type Aligned } from './align';
import { cached, type AnalysisMemo } from './memo';
import type { CapturePhoto, Normalised } from './normalise';

/** What the optics readings need beyond the photos: from the camera profile and the stack's display element. */
export interface OpticsOptions {
  /** Degrees per camera pixel, measured on a target of known angle (a camera profile's). */
  degreesPerPixel?: number | null;
  /** The display's resolution in pixels, for pixels per degree. */
  displayResolution?: { width: number; height: number } | null;
  /** The display's own white chromaticity, the reference for Δu′v′ (D65 otherwise). */
  displayWhite?: Chromaticity | null;
}

/** Checks the optics options, throwing EngineInputError with a message the user can act on. */
export function checkOpticsOptions(o: OpticsOptions): void {
  const d = o.degreesPerPixel;
  if (d !== undefined && d !== null && !(Number.isFinite(d) && d >= DEGREES_PER_PIXEL_BOUNDS[0] && d <= DEGREES_PER_PIXEL_BOUNDS[1])) {
    throw new EngineInputError('bad-argument', `degrees per pixel must be a number from ${DEGREES_PER_PIXEL_BOUNDS[0]} to ${DEGREES_PER_PIXEL_BOUNDS[1]}`);
  }
  const r = o.displayResolution;
  if (r && !(Number.isInteger(r.width) && Number.isInteger(r.height) && r.width >= 1 && r.height >= 1 && r.width <= 100_000 && r.height <= 100_000)) {
    throw new EngineInputError('bad-argument', 'the display resolution must be whole pixels width × height, each from 1 to 100000');
  }
  const w = o.displayWhite;
  if (w && !(Number.isFinite(w.x) && Number.isFinite(w.y) && w.x > 0 && w.y > 0 && w.x + w.y < 1)) {
    throw new EngineInputError('bad-argument', 'the display white must be a chromaticity x, y with x > 0, y > 0 and x + y < 1');
  }
}

export type SharpnessReading = NonNullable<CaptureResult['sharpness']>;
export type GeometryReading = NonNullable<CaptureResult['geometry']>;
export type ColourReading = NonNullable<CaptureResult['displayColour']>;

/** Field of view of the screen (docs/method.md §5.11); null when neither profile nor EXIF gives the camera's focal length. */
export function measureGeometry(n: Normalised, screen: Rect, o: OpticsOptions): GeometryReading | null {
  const on = n.photos.on as CapturePhoto;
  const focal = focalLengthPx(n.width, n.height, { degreesPerPixel: o.degreesPerPixel ?? null, exposure: on.exposure ?? null });
  if (!focal) return null;
  const g = screenGeometry(screen, { width: n.width, height: n.height }, focal, o.displayResolution ?? null);
  const r = (v: number, d: number): number => Math.round(v * 10 ** d) / 10 ** d;
  return { fovH: r(g.fovH, 3), fovV: r(g.fovV, 3), fovD: r(g.fovD, 3), degreesPerPixel: r(g.degreesPerPixel, 7), source: g.source, pixelsPerDegree: g.pixelsPerDegree === null ? null : r(g.pixelsPerDegree, 2) };
}

/** The room light left in the aligned small dark plane as a share of the off photo's (the analysis's own estimate). */
export type RoomShare = (darkSmall: Plane) => number;

/** Pixels sampled per photo for the display colour: enough that the mean's noise is far below a just-noticeable Δu′v′. */
export const COLOUR_BUDGET = 270_000;

/**
 * The display's colour over the screen (docs/method.md §5.12): its light (on − off, or the dark
 * photo less the room light it holds) in linear R, G, B over the 3 × 3 grid for a full-white
 * screen (the colour uniformity), over the whole screen for the other patterns.
 */
export function measureDisplayColour(n: Normalised, a: Aligned, pattern: Pattern, o: OpticsOptions, roomShare: RoomShare): ColourReading | null {
  const screen = a.screen;
  const grid = pattern === 'full' && screen.w >= 3 && screen.h >= 3;
  const rects = grid ? gridCells(screen, 3, 3) : [screen];
  const budget = Math.ceil(COLOUR_BUDGET / rects.length);
  const means = (role: PhotoRole): RgbMean[] => {
    const p = n.photos[role] as CapturePhoto;
    const m = a.motion[role] as Motion | undefined;
    const offsets: Offset[] = rects.map((r) => (m ? roundedOffsetIn(m, r) : { dx: 0, dy: 0 }));
    return sampledRgbMeans(p.raster, rects, offsets, budget);
  };
  const first: PhotoRole = n.photos.dark ? 'dark' : 'on';
  const a1 = means(first);
  const a2 = means('off');
  // with a dark photo, the room light it holds as a share k of the off photo's (docs/method.md §5.8)
  const k = first === 'dark' ? roomShare(warpPlane(n.small.dark as Plane, scaleMotion(a.motion.dark as Motion, n.factor))) : 1;
  const s1 = n.scale[first] as number;
  const s2 = (n.scale.off as number) * k;
  const cells: RgbMean[] = a1.map((p, i) => {
    const q = a2[i] as RgbMean;
    return { r: p.r * s1 - q.r * s2, g: p.g * s1 - q.g * s2, b: p.b * s1 - q.b * s2, n: Math.min(p.n, q.n) };
  });
  return displayColourOf(cells, { white: o.displayWhite ?? null, grid });
}

/** Where the pattern's dark square lies in full-resolution pixels, from the small difference plane. */
interface Square {
  cx: number;
  cy: number;
  /** Half extents of its bounding box. */
  ex: number;
  ey: number;
  /** Mid level between the square and the white around it, and the small plane's row of the square's centre. */
  mid: number;
}

function locateSquare(d: Plane, screen: Rect, factor: number, noise: number): Square | string {
  const sx0 = Math.ceil((screen.x + 0.06 * screen.w) / factor);
  const sx1 = Math.floor((screen.x + 0.94 * screen.w) / factor);
  const sy0 = Math.ceil((screen.y + 0.06 * screen.h) / factor);
  const sy1 = Math.floor((screen.y + 0.94 * screen.h) / factor);
  if (sx1 - sx0 < 8 || sy1 - sy0 < 8) return 'the screen is too small in the photo for the slanted-edge square';
  const w = d.width;
  const values = new Float64Array((sx1 - sx0) * (sy1 - sy0));
  let i = 0;
  for (let y = sy0; y < sy1; y++) for (let x = sx0; x < sx1; x++) values[i++] = d.data[y * w + x] as number;
  const lo = percentile(values, 5);
  const hi = percentile(values, 95);
  if (!(hi - lo > Math.max(8 * noise, 1e-9))) return 'no dark square stands out on the screen: show the slanted-edge pattern full screen';
  const mid = (lo + hi) / 2;
  const rows = new Float64Array(sy1 - sy0);
  const cols = new Float64Array(sx1 - sx0);
  for (let y = sy0; y < sy1; y++) {
    for (let x = sx0; x < sx1; x++) {
      if ((d.data[y * w + x] as number) < mid) {
        rows[y - sy0] = (rows[y - sy0] as number) + 1;
        cols[x - sx0] = (cols[x - sx0] as number) + 1;
      }
    }
  }
  const span = (counts: Float64Array): [number, number] | null => {
    let max = 0;
    for (const c of counts) max = Math.max(max, c);
    if (max < 4) return null;
    let first = -1;
    let last = -1;
    for (let j = 0; j < counts.length; j++) {
      if ((counts[j] as number) >= 0.2 * max) {
        if (first < 0) first = j;
        last = j;
      }
    }
    return [first, last];
  };
  const ry = span(rows);
  const rx = span(cols);
  if (!ry || !rx) return 'no dark square found on the screen';
  if (rx[0] === 0 || ry[0] === 0 || rx[1] === cols.length - 1 || ry[1] === rows.length - 1) return 'the dark part of the screen reaches its border: show the slanted-edge pattern (a dark square on white) full screen';
  const x0 = (sx0 + rx[0]) * factor;
  const x1 = (sx0 + rx[1] + 1) * factor;
  const y0 = (sy0 + ry[0]) * factor;
  const y1 = (sy0 + ry[1] + 1) * factor;
  return { cx: (x0 + x1) / 2, cy: (y0 + y1) / 2, ex: (x1 - x0) / 2, ey: (y1 - y0) / 2, mid };
}

/** The first crossing of `mid` along a small-plane line from `from` towards `to` (full-resolution pixels), or null. */
function crossing(d: Plane, factor: number, along: 'x' | 'y', fixed: number, from: number, to: number, mid: number): number | null {
  const f = Math.round(fixed / factor);
  const a = Math.round(from / factor);
  const b = Math.round(to / factor);
  const dir = b >= a ? 1 : -1;
  const at = (t: number): number => (along === 'x' ? (d.data[f * d.width + t] as number) : (d.data[t * d.width + f] as number));
  const limit = along === 'x' ? d.width : d.height;
  const startBright = at(Math.max(0, Math.min(limit - 1, a))) >= mid;
  for (let t = a; t !== b + dir; t += dir) {
    if (t < 0 || t >= limit) return null;
    if (at(t) >= mid !== startBright) return (t + 0.5) * factor;
  }
  return null;
}

/** Turn limit the edge regions allow for (pattern's 5° plus a tilted camera or display), degrees. */
const MAX_TURN_DEG = 15;
/** Rows along each edge read at most: enough for the quarter-pixel bins many times over. */
const MAX_EDGE_ROWS = 320;

/**
 * Slanted-edge MTF of the pattern's square (docs/method.md §5.10): the square is found on the small
 * difference plane, each of its four sides read at full resolution over the middle 60% of its length
 * (its light: on − off, or the dark photo) and measured as a slanted edge; the reading is the mean of
 * the sides' MTFs. Null with a warning when no side can be measured.
 */
export function measureSharpness(n: Normalised, a: Aligned, degreesPerPixel: number | null, warnings: EngineWarning[]): SharpnessReading | null {
  const fail = (why: string): null => {
    warnings.push({ code: 'sharpness-unmeasured', message: `no sharpness reading: ${why}` });
    return null;
  };
  const { factor } = n;
  const screen = a.screen;
  const sq = locateSquare(a.diffSmall, screen, factor, a.diffSigma);
  if (typeof sq === 'string') return fail(sq);
  // the light of the display alone: the dark photo (its room light is a constant offset here, which
  // the line spread drops), else on − off
  const read: DiffReader = n.photos.dark ? diffReader(sourceOf(n, 'dark', a.motion.dark as Motion)) : a.readDiff;
  // half-window across the edge: six edge rises of the screen's own border and some room
  // (2 px when the border showed no clear step to measure it on)
  const rise = Number.isFinite(a.spread.width) && a.spread.width > 0 ? a.spread.width : 2;
  const want = Math.min(96, Math.max(16, Math.ceil(6 * rise) + 8));
  const tan = Math.tan((MAX_TURN_DEG * Math.PI) / 180);
  const inner = { x0: screen.x + a.spread.zone, y0: screen.y + a.spread.zone, x1: screen.x + screen.w - a.spread.zone, y1: screen.y + screen.h - a.spread.zone };
  const edges: EdgeMtf[] = [];
  const reasons: string[] = [];
  for (const side of ['left', 'right', 'top', 'bottom'] as const) {
    const vertical = side === 'left' || side === 'right';
    const half = Math.floor(Math.min(MAX_EDGE_ROWS / 2, 0.3 * (vertical ? sq.ey : sq.ex)));
    if (half < 8) {
      reasons.push(`${side}: the square is too small in the photo`);
      continue;
    }
    // where the side crosses the square's middle line, from the small plane
    const e = vertical
      ? crossing(a.diffSmall, factor, 'x', sq.cy, side === 'left' ? sq.cx - sq.ex - 2 * factor : sq.cx + sq.ex + 2 * factor, sq.cx, sq.mid)
      : crossing(a.diffSmall, factor, 'y', sq.cx, side === 'top' ? sq.cy - sq.ey - 2 * factor : sq.cy + sq.ey + 2 * factor, sq.cy, sq.mid);
    if (e === null) {
      reasons.push(`${side}: edge not found`);
      continue;
    }
    const slack = Math.ceil(half * tan + 2 * factor);
    // the room outside the edge (to the screen's border less its edge zone) and inside (to the square's middle)
    const outside = vertical ? (side === 'left' ? e - inner.x0 : inner.x1 - e) : side === 'top' ? e - inner.y0 : inner.y1 - e;
    const insideRoom = vertical ? sq.ex : sq.ey;
    const R = Math.floor(Math.min(want, outside - slack, insideRoom - slack));
    if (R < MIN_HALF_WIDTH) {
      reasons.push(`${side}: too little room around the edge`);
      continue;
    }
    const c = vertical ? sq.cy : sq.cx;
    const a0 = Math.round(e - R - slack);
    const a1 = Math.round(e + R + slack);
    const b0 = Math.round(c - half);
    const rect: Rect = vertical ? { x: a0, y: b0, w: a1 - a0, h: 2 * half } : { x: b0, y: a0, w: 2 * half, h: a1 - a0 };
    if (rect.x < 0 || rect.y < 0 || rect.x + rect.w > n.width || rect.y + rect.h > n.height) {
      reasons.push(`${side}: the edge region leaves the photo`);
      continue;
    }
    const data = read(rect);
    const plane: Plane = { data, width: rect.w, height: rect.h };
    const r = slantedEdgeMtf(vertical ? plane : transposePlane(plane), { halfWidth: R });
    if (r.ok) edges.push(r.edge);
    else reasons.push(`${side}: ${r.reason}`);
  }
  if (edges.length === 0) return fail(reasons.join('; '));
  const { fine, mtf50 } = meanMtf(edges);
  if (mtf50 === null) return fail('the mean MTF stays above 0.5 up to 1 cycle per pixel (a sharpened photo?)');
  const angle = edges.reduce((s, x) => s + Math.abs(x.angleDeg), 0) / edges.length;
  if (edges.length < 4) warnings.push({ code: 'sharpness-unmeasured', message: `the sharpness is the mean of ${edges.length} of the square's 4 sides (${reasons.join('; ')})` });
  return {
    mtf50: Math.round(mtf50 * 1e4) / 1e4,
    mtf50PerDegree: degreesPerPixel ? Math.round((mtf50 / degreesPerPixel) * 1000) / 1000 : null,
    edgeAngle: Math.round(angle * 100) / 100,
    curve: curveOf(fine),
  };
}

/**
 * The three optics readings of a capture: sharpness (slanted-edge pattern only), the screen's field
 * of view, and the display's colour.
 */
export function opticsReadings(n: Normalised, a: Aligned, pattern: Pattern, o: OpticsOptions, warnings: EngineWarning[], roomShare: RoomShare, memo: AnalysisMemo | null = null): { sharpness: SharpnessReading | null; geometry: GeometryReading | null; displayColour: ColourReading | null } {
  const geometry = measureGeometry(n, a.screen, o);
  // a caller that analyses the on and off photos first and the full set after meets the same inputs twice
  const m = (role: PhotoRole): string => {
    const x = a.motion[role];
    return x ? `${x.dx},${x.dy},${x.angle}` : '-';
  };
  const s = a.screen;
  const base = `${n.key.on}:${n.key.off}:${n.key.dark ?? '-'}:${m('off')}:${m('dark')}:${s.x},${s.y},${s.w},${s.h}`;
  let sharpness: SharpnessReading | null = null;
  if (pattern === 'slanted-edge') {
    const dpp = geometry?.degreesPerPixel ?? null;
    const got = cached(memo, `sharpness:${base}:${dpp}`, () => {
      const w: EngineWarning[] = [];
      return { reading: measureSharpness(n, a, dpp, w), warnings: w };
    });
    warnings.push(...got.warnings);
    sharpness = got.reading;
  }
  const white = o.displayWhite ? `${o.displayWhite.x},${o.displayWhite.y}` : 'D65';
  const displayColour = cached(memo, `colour:${base}:${pattern}:${white}`, () => measureDisplayColour(n, a, pattern, o, roomShare));
  return { sharpness, geometry, displayColour };
}
