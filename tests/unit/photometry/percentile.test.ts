import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { percentile, robustSigma } from '../../../lib/photometry/percentile';
import { seededRandom } from '../../fixtures/seeded-random';

// Oracle: jStat.percentile (inclusive: linear interpolation between order statistics, the
// definition PERCENTILE.INC and R's type 7 use), on a sorted copy.
const oraclePercentile = (v: number[], p: number): number => jStat.percentile([...v].sort((a, b) => a - b), p / 100, false);


// planes' sizes and shapes: long, with ties, sorted, constant or periodic
const shapes: [string, (n: number, r: () => number) => number[]][] = [
  ['uniform', (n, r) => Array.from({ length: n }, r)],
  ['skewed (cubes)', (n, r) => Array.from({ length: n }, () => r() ** 3 - 0.01)],
  ['half zeros (ties)', (n, r) => Array.from({ length: n }, () => (r() < 0.5 ? 0 : r()))],
  ['few distinct values', (n, r) => Array.from({ length: n }, () => Math.floor(r() * 5))],
  ['sorted', (n) => Array.from({ length: n }, (_, i) => i / n)],
  ['reversed', (n) => Array.from({ length: n }, (_, i) => (n - i) / n)],
  ['constant', (n) => Array.from({ length: n }, () => 0.25)],
  ['rows of an image (strided sample meets a pattern)', (n) => Array.from({ length: n }, (_, i) => ((i % 1024) < 512 ? 1 : 0) + (i % 7) * 1e-3)],
];

describe('percentile and robustSigma give the exact order statistics (jStat as oracle)', () => {
  for (const [name, make] of shapes) {
    for (const n of [19_999, 20_000, 54_321]) {
      it(`${name}, ${n} values`, () => {
        const v = make(n, seededRandom(n));
        for (const p of [0, 0.5, 25, 50, 75, 99, 99.5, 100]) expect(percentile(v, p)).toBe(oraclePercentile(v, p));
        const med = oraclePercentile(v, 50);
        const mad = oraclePercentile(v.map((x) => Math.abs(x - med)), 50);
        expect(robustSigma(v)).toBe(1.4826 * mad);
      });
    }
  }

  it('keeps the input as it was and ignores non-finite values', () => {
    const r = seededRandom(7);
    const v = Float32Array.from({ length: 30_000 }, () => r());
    v[5] = Number.NaN;
    v[6] = Number.POSITIVE_INFINITY;
    const copy = Float32Array.from(v);
    const finite = Array.from(v).filter(Number.isFinite);
    expect(percentile(v, 90)).toBe(oraclePercentile(finite, 90));
    expect(Array.from(v)).toEqual(Array.from(copy));
  });
});
