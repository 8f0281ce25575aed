import { connectedComponents } from './components';
import { percentile } from './percentile';
import type { Plane, Rect } from './types';

/** Every k-th value, k chosen so at most `limit` remain: percentiles of large planes need no more. */
export function strided(values: ArrayLike<number>, limit: number): ArrayLike<number> {
  if (values.length <= limit) return values;
  const step = Math.ceil(values.length / limit);
  const out = new Float64Array(Math.ceil(values.length / step));
  for (let i = 0, k = 0; i < values.length; i += step, k++) out[k] = values[i] as number;
  return out;
}

/** Components below this share of the largest are specks (noise, JPEG ringing, highlights that moved). */
const SMALL_COMPONENT = 0.05;
/**
 * A display fills its box (a checkerboard half of it); scattered room objects that brightened
 * between the photos (the exposure or the light changed, the display stayed off) fill little of theirs.
 */
const MIN_FILL = 0.25;

/**
 * The display's bounding box in a difference plane D = on − off: threshold at half of the 99.5th
 * percentile, drop small components, box what remains. Null when D holds no display light: its
 * 99.5th percentile is within 5 noise sigmas of zero, or what stands out fills less than a quarter
 * of its box (scattered room objects, not a lit display).
 */
export function detectScreen(diff: Plane, noiseSigma = 0): Rect | null {
  const { width, height, data } = diff;
  if (data.length !== width * height || width < 1 || height < 1) throw new RangeError('plane data does not match its size');
  const p = percentile(strided(data, 400_000), 99.5);
  if (!Number.isFinite(p) || p <= 0 || p <= 5 * noiseSigma) return null;
  const threshold = p / 2;
  const mask = new Uint8Array(width * height);
  for (let i = 0; i < mask.length; i++) mask[i] = (data[i] as number) >= threshold ? 1 : 0;
  const comps = connectedComponents(mask, width, height);
  if (comps.length === 0) return null;
  const largest = Math.max(...comps.map((c) => c.area));
  const kept = comps.filter((c) => c.area >= Math.max(2, SMALL_COMPONENT * largest));
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (const c of kept) {
    x0 = Math.min(x0, c.box.x);
    y0 = Math.min(y0, c.box.y);
    x1 = Math.max(x1, c.box.x + c.box.w);
    y1 = Math.max(y1, c.box.y + c.box.h);
  }
  if (kept.length === 0) return null;
  const filled = kept.reduce((a, c) => a + c.area, 0);
  if (filled < MIN_FILL * (x1 - x0) * (y1 - y0)) return null;
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}
