import { assertRectInside } from './rect';
import type { Plane, Rect } from './types';

export interface RegionStats {
  /** Number of finite pixels used. */
  n: number;
  mean: number;
  /** Sample standard deviation (n − 1); NaN for n < 2. */
  sd: number;
}

function assertPlane(plane: Plane<ArrayLike<number>>): void {
  const { width, height, data } = plane;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1) {
    throw new RangeError(`plane size must be positive integers, got ${width} × ${height}`);
  }
  if (data.length !== width * height) throw new RangeError(`plane data has ${data.length} values, expected ${width * height}`);
}

/** Sum and count of the finite pixels of a rectangle, summed in float64. */
export function regionSum(plane: Plane<ArrayLike<number>>, rect: Rect): { sum: number; n: number } {
  assertPlane(plane);
  assertRectInside(rect, plane.width, plane.height);
  const { data, width } = plane;
  let sum = 0;
  let n = 0;
  for (let y = rect.y; y < rect.y + rect.h; y++) {
    const row = y * width;
    for (let i = row + rect.x, end = row + rect.x + rect.w; i < end; i++) {
      const v = data[i] as number;
      // NaN marks pixels with no data (outside a shifted photo): skip them
      if (v === v) {
        sum += v;
        n++;
      }
    }
  }
  return { sum, n };
}

/** Mean of the finite pixels of a rectangle (NaN when none). */
export function regionMean(plane: Plane<ArrayLike<number>>, rect: Rect): number {
  const { sum, n } = regionSum(plane, rect);
  return n === 0 ? Number.NaN : sum / n;
}

/** Mean and standard deviation of a rectangle by two passes in float64, accurate for large offsets. */
export function regionStats(plane: Plane<ArrayLike<number>>, rect: Rect): RegionStats {
  const { sum, n } = regionSum(plane, rect);
  if (n === 0) return { n, mean: Number.NaN, sd: Number.NaN };
  const mean0 = sum / n;
  const { data, width } = plane;
  // NIST StRD NumAcc: a second pass on deviations (with the correction term) avoids the textbook one-pass cancellation
  let ss = 0;
  let corr = 0;
  for (let y = rect.y; y < rect.y + rect.h; y++) {
    const row = y * width;
    for (let i = row + rect.x, end = row + rect.x + rect.w; i < end; i++) {
      const v = data[i] as number;
      if (v === v) {
        const d = v - mean0;
        ss += d * d;
        corr += d;
      }
    }
  }
  const mean = mean0 + corr / n;
  const sd = n < 2 ? Number.NaN : Math.sqrt(Math.max(0, (ss - (corr * corr) / n) / (n - 1)));
  return { n, mean, sd };
}
