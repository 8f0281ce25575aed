import type { Offset, Rect } from './types';

/**
 * Where a photo's features sit against the on photo: a feature at p in the on photo lies at
 * c + R(angle)·(p − c) + (dx, dy) in the other photo, c the on photo's centre. A pure translation
 * has angle 0. Angles are in radians, positive from +x towards +y (clockwise on screen).
 */
export interface Motion extends Offset {
  angle: number;
  cx: number;
  cy: number;
}

/** A translation as a motion about the centre of a width × height frame. */
export function translation(o: Offset, width: number, height: number): Motion {
  return { dx: o.dx, dy: o.dy, angle: 0, cx: (width - 1) / 2, cy: (height - 1) / 2 };
}

/** Displacement of the feature at (x, y) of the on photo in the other photo. */
export function offsetAt(m: Motion, x: number, y: number): Offset {
  if (m.angle === 0) return { dx: m.dx, dy: m.dy };
  const c = Math.cos(m.angle);
  const s = Math.sin(m.angle);
  const u = x - m.cx;
  const v = y - m.cy;
  return { dx: m.dx + (c - 1) * u - s * v, dy: m.dy + s * u + (c - 1) * v };
}

/** The whole-pixel displacement at a rectangle's centre (what a pass over raw pixels can use). */
export function roundedOffsetIn(m: Motion, r: Rect): Offset {
  const o = offsetAt(m, r.x + (r.w - 1) / 2, r.y + (r.h - 1) / 2);
  return { dx: Math.round(o.dx), dy: Math.round(o.dy) };
}

/** The same motion in a plane downsampled by `factor` (block (i, j) covers pixels factor·i …). */
export function scaleMotion(m: Motion, factor: number): Motion {
  // a block's centre sits at factor·i + (factor − 1)/2 in the photo
  const toSmall = (p: number): number => (p - (factor - 1) / 2) / factor;
  return { dx: m.dx / factor, dy: m.dy / factor, angle: m.angle, cx: toSmall(m.cx), cy: toSmall(m.cy) };
}

/** Largest displacement over the corners of a width × height frame. */
export function largestDisplacement(m: Motion, width: number, height: number): number {
  let worst = 0;
  for (const [x, y] of [[0, 0], [width - 1, 0], [0, height - 1], [width - 1, height - 1]] as const) {
    const o = offsetAt(m, x, y);
    worst = Math.max(worst, Math.hypot(o.dx, o.dy));
  }
  return worst;
}
