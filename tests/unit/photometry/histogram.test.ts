import { describe, expect, it } from 'vitest';
import { luminanceHistogram } from '../../../lib/photometry';
import { seededRandom } from '../../fixtures/capture-generator';

// The float32 path bins by bit pattern (a table, then a step past an edge). It must give the counts
// of the definition written out here: bin ⌊(log2 v − log2Min) · bins / (log2Max − log2Min)⌋,
// clamped below to 0, above the top counted apart, v ≤ 0 counted apart, NaN skipped.

function definition(values: ArrayLike<number>, bins: number, lo: number, hi: number, step: number) {
  const counts = new Array<number>(bins).fill(0);
  let nonPositive = 0;
  let above = 0;
  let total = 0;
  for (let i = 0; i < values.length; i += step) {
    const v = values[i] as number;
    if (Number.isNaN(v)) continue;
    total++;
    if (v <= 0) {
      nonPositive++;
      continue;
    }
    const k = Math.floor((Math.log2(v) - lo) * (bins / (hi - lo)));
    if (k >= bins) above++;
    else counts[Math.max(0, k)] = (counts[Math.max(0, k)] as number) + 1;
  }
  return { counts, nonPositive, above, total };
}

function bitsToFloat(bits: number[]): Float32Array {
  return new Float32Array(Uint32Array.from(bits).buffer);
}

function expectSame(values: Float32Array, bins: number, lo: number, hi: number, step = 1): void {
  const got = luminanceHistogram(values, bins, lo, hi, step);
  const want = definition(values, bins, lo, hi, step);
  expect(got.counts).toEqual(want.counts);
  expect(got.nonPositive).toBe(want.nonPositive);
  expect(got.above).toBe(want.above);
  expect(got.total).toBe(want.total);
  // the general path (any array of numbers) agrees as well
  const general = luminanceHistogram(Array.from(values), bins, lo, hi, step);
  expect(general.counts).toEqual(got.counts);
  expect([general.nonPositive, general.above, general.total]).toEqual([got.nonPositive, got.above, got.total]);
}

describe('luminanceHistogram on float32 planes', () => {
  it('bins log-uniform values across and beyond the range like the definition', () => {
    const rand = seededRandom(96);
    const values = Float32Array.from({ length: 200_000 }, () => 2 ** (-20 + 26 * rand()));
    expectSame(values, 96, -14, 2);
    expectSame(values, 96, -14, 2, 3);
    expectSame(values, 7, -3.3, 1.1);
    expectSame(values, 300, -14, 2);
  });

  it('puts every float32 next to every bin edge where the definition does', () => {
    // the powers of two at each edge and the 64 float32 values on either side of it
    const bits: number[] = [];
    const f = new Float32Array(1);
    const u = new Uint32Array(f.buffer);
    for (let j = 0; j <= 96; j++) {
      f[0] = 2 ** (-14 + j / 6);
      for (let d = -64; d <= 64; d++) bits.push((u[0] as number) + d);
    }
    expectSame(bitsToFloat(bits), 96, -14, 2);
    const thirds: number[] = [];
    for (let j = 0; j <= 10; j++) {
      f[0] = 2 ** (-1 + j / 3);
      for (let d = -64; d <= 64; d++) thirds.push((u[0] as number) + d);
    }
    expectSame(bitsToFloat(thirds), 10, -1, 2.3333333);
  });

  it('counts zero, negatives, NaN, infinity, subnormals and the extremes as the definition does', () => {
    const special = new Float32Array([0, -0, -1, -1e-30, Number.NaN, -Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 1e-45, 1e-40, 3.4e38, 2 ** -14, 4, 3.99999, 1]);
    expectSame(special, 96, -14, 2);
    const h = luminanceHistogram(special, 96, -14, 2);
    expect(h.nonPositive).toBe(5);
    expect(h.total).toBe(13);
  });

  it('reads a float32 view that starts inside a larger buffer', () => {
    const rand = seededRandom(7);
    const whole = Float32Array.from({ length: 10_001 }, () => rand() * 4);
    expectSame(whole.subarray(1), 96, -14, 2);
  });
});
