import { describe, expect, it } from 'vitest';
import { regionMean, regionStats, gridCells, rectIoU, percentile, robustSigma } from '../../../lib/photometry';

const plane = (values: number[], width = values.length) => ({ data: Float64Array.from(values), width, height: values.length / width });

describe('region statistics — NIST StRD univariate datasets (published, public domain)', () => {
  it('NumAcc1 {10000001, 10000003, 10000002}: mean 10000002, SD 1', () => {
    const s = regionStats(plane([10000001, 10000003, 10000002]), { x: 0, y: 0, w: 3, h: 1 });
    expect(s.mean).toBe(10000002);
    expect(s.sd).toBeCloseTo(1, 12);
  });

  it('NumAcc4: 10000000.2 then 500 pairs of (10000000.1, 10000000.3): mean 10000000.2, SD 0.1', () => {
    const v = [10000000.2];
    for (let i = 0; i < 500; i++) v.push(10000000.1, 10000000.3);
    // 1001 values laid out as 7 × 143 to exercise rows as well
    const s = regionStats(plane(v, 143), { x: 0, y: 0, w: 143, h: 7 });
    expect(s.n).toBe(1001);
    expect(Math.abs(s.mean - 10000000.2)).toBeLessThan(1e-8);
    expect(s.sd).toBeCloseTo(0.1, 8);
  });

  it('would fail NumAcc4 if it summed in float32 (the data itself cannot be stored in float32)', () => {
    expect(Math.fround(10000000.1)).not.toBe(10000000.1);
  });
});

describe('regionMean and regionStats edge cases', () => {
  it('handles a 1 × 1 plane (SD undefined)', () => {
    const s = regionStats(plane([4]), { x: 0, y: 0, w: 1, h: 1 });
    expect(s).toEqual({ n: 1, mean: 4, sd: Number.NaN });
  });

  it('skips NaN pixels (no data where a shifted photo ends)', () => {
    expect(regionMean(plane([1, Number.NaN, 3, Number.NaN], 2), { x: 0, y: 0, w: 2, h: 2 })).toBe(2);
    expect(regionMean(plane([Number.NaN]), { x: 0, y: 0, w: 1, h: 1 })).toBeNaN();
  });

  it('averages only the rectangle in an odd-sized plane', () => {
    const p = plane([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15], 5);
    expect(regionMean(p, { x: 1, y: 1, w: 3, h: 2 })).toBeCloseTo((7 + 8 + 9 + 12 + 13 + 14) / 6, 12);
  });

  it('refuses empty, fractional and outside rectangles with RangeError', () => {
    const p = plane([1, 2, 3, 4], 2);
    expect(() => regionMean(p, { x: 0, y: 0, w: 0, h: 1 })).toThrow(RangeError);
    expect(() => regionMean(p, { x: 0.5, y: 0, w: 1, h: 1 })).toThrow(RangeError);
    expect(() => regionMean(p, { x: 1, y: 1, w: 2, h: 1 })).toThrow(RangeError);
    expect(() => regionMean({ data: new Float32Array(3), width: 2, height: 2 }, { x: 0, y: 0, w: 1, h: 1 })).toThrow(RangeError);
  });
});

describe('grids and rectangles', () => {
  it('tiles a rectangle into 3 × 3 cells without gaps', () => {
    const cells = gridCells({ x: 10, y: 20, w: 100, h: 61 }, 3, 3);
    expect(cells.reduce((a, c) => a + c.w * c.h, 0)).toBe(100 * 61);
  });

  it('keeps the central 50% × 50% of each checkerboard cell', () => {
    const [first] = gridCells({ x: 0, y: 0, w: 400, h: 200 }, 4, 4, 0.5);
    expect(first).toEqual({ x: 25, y: 13, w: 50, h: 24 });
  });

  it('refuses a grid finer than the rectangle', () => {
    expect(() => gridCells({ x: 0, y: 0, w: 3, h: 3 }, 4, 4, 0.5)).toThrow(RangeError);
  });

  it('computes IoU: 1 for equal, 0 for disjoint, 1/3 for half-overlapping equal boxes', () => {
    const a = { x: 0, y: 0, w: 10, h: 10 };
    expect(rectIoU(a, a)).toBe(1);
    expect(rectIoU(a, { x: 20, y: 0, w: 5, h: 5 })).toBe(0);
    expect(rectIoU(a, { x: 5, y: 0, w: 10, h: 10 })).toBeCloseTo(1 / 3, 12);
  });
});

describe('percentiles', () => {
  it('interpolates between order statistics and ignores NaN', () => {
    expect(percentile([3, 1, 2, Number.NaN, 4], 50)).toBe(2.5);
    expect(percentile([5], 99.5)).toBe(5);
    expect(percentile([], 50)).toBeNaN();
    expect(() => percentile([1], 101)).toThrow(RangeError);
  });

  it('estimates the SD of a normal sample robustly, even with outliers', () => {
    const v: number[] = [];
    for (let i = 1; i < 2000; i++) v.push(Math.SQRT2 * inverseErf(2 * (i / 2000) - 1));
    v.push(1e9, 1e9);
    expect(robustSigma(v)).toBeCloseTo(1, 1);
  });
});

// Giles' single-precision approximation of erf⁻¹, good to ~1e-7 — enough for a test sample
function inverseErf(x: number): number {
  let w = -Math.log((1 - x) * (1 + x));
  let p: number;
  if (w < 5) {
    w -= 2.5;
    p = 2.81022636e-8;
    for (const c of [3.43273939e-7, -3.5233877e-6, -4.39150654e-6, 0.00021858087, -0.00125372503, -0.00417768164, 0.246640727, 1.50140941]) p = c + p * w;
  } else {
    w = Math.sqrt(w) - 3;
    p = -0.000200214257;
    for (const c of [0.000100950558, 0.00134934322, -0.00367342844, 0.00573950773, -0.0076224613, 0.00943887047, 1.00167406, 2.83297682]) p = c + p * w;
  }
  return p * x;
}
