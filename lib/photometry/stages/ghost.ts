import { GHOST_MIN_SNR, searchGhost } from '../ghost-search';
import { measureGhostOneSided, type OneSidedGhost } from '../ghost-measure';
import type { GhostResult } from '../result';
import { refineGhostOffsetWith, type DiffReader } from '../screen-edges';
import type { Offset, Plane, Rect } from '../types';
import { cached, type AnalysisMemo } from './memo';

/** A ghost counts only when at least this share of the light in its band is one-sided (not what the screen spreads on every side alike). */
export const GHOST_MIN_ONE_SIDED = 0.5;

const round1 = (v: number): number => Math.round(v * 10) / 10;

export interface GhostVariantInput {
  /** D at the small planes' resolution (on − off aligned, or the aligned dark photo). */
  plane: Plane;
  /** D at full resolution. */
  read: DiffReader;
  /** Identity of the plane and reader for the memo (null: not memoised). */
  key: string | null;
  screen: Rect;
  factor: number;
  width: number;
  height: number;
  /** Edge zone, full-resolution px. */
  zone: number;
  /** A marked offset, 'none', or null to search. */
  marked: Offset | 'none' | null;
  /** Mean of D far from the display (outside the registration mask), or null when none is left. */
  background?: number | null;
}

/** The screen in the small plane: every block it touches. */
function screenBlocks(screen: Rect, factor: number, plane: Plane): Rect {
  const x0 = Math.floor(screen.x / factor);
  const y0 = Math.floor(screen.y / factor);
  const x1 = Math.max(x0 + 1, Math.ceil((screen.x + screen.w) / factor));
  const y1 = Math.max(y0 + 1, Math.ceil((screen.y + screen.h) / factor));
  return { x: x0, y: y0, w: Math.min(plane.width, x1) - x0, h: Math.min(plane.height, y1) - y0 };
}

function toResult(m: OneSidedGhost, offset: Offset, source: 'marked' | 'detected', zone: number): GhostResult {
  return {
    ratio: m.ratio,
    dx: round1(offset.dx),
    dy: round1(offset.dy),
    source,
    firstOrder: m.firstOrder,
    snr: Number.isFinite(m.snr) ? m.snr : null,
    edgeZone: zone,
    mirrorRatio: m.s1 > 0 ? m.mirror / m.s1 : 0,
    oneSided: m.oneSided,
  };
}

/**
 * The ghost of one variant (docs/method.md §5.8): marked, or searched on the small plane as the
 * strongest one-sided displaced copy of the screen, its offset put to a fraction of a pixel from
 * its own edges at full resolution, and measured there on its band's plateau against the mirrored
 * band. A detected ghost is reported only when its one-sided excess stands GHOST_MIN_SNR standard
 * errors above the noise and holds at least GHOST_MIN_ONE_SIDED of the band's light.
 */
export function findGhost(v: GhostVariantInput, memo: AnalysisMemo | null): GhostResult | null {
  if (v.marked === 'none') return null;
  const { screen, zone, factor } = v;
  if (v.marked) {
    const o = v.marked;
    const m = measureGhostOneSided(v.read, screen, o, zone, v.background ?? null);
    return m && Number.isFinite(m.ratio) ? toResult(m, o, 'marked', zone) : null;
  }
  const zoneBlocks = factor > 1 ? Math.ceil(zone / factor) + 1 : zone;
  const ss = screenBlocks(screen, factor, v.plane);
  if (ss.w < 1 || ss.h < 1) return null;
  const run = (): { offset: Offset; m: OneSidedGhost } | null => {
    const c = searchGhost(v.plane, ss, zoneBlocks);
    if (!c || !(c.gain > 0)) return null;
    const coarse = { dx: c.dx * factor, dy: c.dy * factor };
    // the search's offset is good to about a block of the small plane
    const offset = refineGhostOffsetWith(screen, coarse, v.read, { width: v.width, height: v.height }, Math.max(2 * factor, 6), zone, factor + 1);
    const whole = { dx: Math.round(offset.dx), dy: Math.round(offset.dy) };
    if (whole.dx === 0 && whole.dy === 0) return null;
    const m = measureGhostOneSided(v.read, screen, whole, zone, v.background ?? null);
    return m ? { offset, m } : null;
  };
  const found = v.key ? cached(memo, `ghost:${v.key}:${screen.x},${screen.y},${screen.w},${screen.h}:${zone}`, run) : run();
  if (!found) return null;
  const { m, offset } = found;
  if (!(m.snr >= GHOST_MIN_SNR) || !(m.oneSided >= GHOST_MIN_ONE_SIDED) || !(m.ratio > 0) || !Number.isFinite(m.ratio)) return null;
  return toResult(m, offset, 'detected', zone);
}
