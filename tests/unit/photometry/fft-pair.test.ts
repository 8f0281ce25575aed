import { describe, expect, it } from 'vitest';
import { crossCorrelateTwo, fft2d, packPair, pairCrossPower } from '../../../lib/photometry';
import { inverseFft2dRows, shiftRows } from '../../../lib/photometry/fft2d';
import { seededRandom } from '../../fixtures/capture-generator';

// The checks below compare the one-transform-for-two shortcuts with the definitions they replace:
// the circular cross-correlation summed directly, and separate transforms of each plane.

function randomPlane(n: number, seed: number): Float64Array {
  const rand = seededRandom(seed);
  return Float64Array.from({ length: n }, () => rand() - 0.3);
}

function directCorrelation(a: Float64Array, b: Float64Array, w: number, h: number, pw: number, ph: number): Float64Array {
  // c(o) = Σ_x a(x + o)·b(x) on the zero-padded, circular pw × ph grid
  const pad = (p: Float64Array): Float64Array => {
    const out = new Float64Array(pw * ph);
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) out[y * pw + x] = p[y * w + x] as number;
    return out;
  };
  const pa = pad(a);
  const pb = pad(b);
  const c = new Float64Array(pw * ph);
  for (let oy = 0; oy < ph; oy++) {
    for (let ox = 0; ox < pw; ox++) {
      let s = 0;
      for (let y = 0; y < ph; y++) {
        for (let x = 0; x < pw; x++) s += (pa[((y + oy) % ph) * pw + ((x + ox) % pw)] as number) * (pb[y * pw + x] as number);
      }
      c[oy * pw + ox] = s;
    }
  }
  return c;
}

describe('two real planes through one transform', () => {
  it('pairCrossPower equals B·conj(A) from separate transforms', () => {
    const w = 6, h = 5, pw = 8, ph = 8;
    const a = randomPlane(w * h, 1);
    const b = randomPlane(w * h, 2);
    const z = packPair(a, b, w, h, pw, ph);
    fft2d(z, pw, ph, false, h);
    const cross = pairCrossPower(z, pw, ph);
    const fa = packPair(a, new Float64Array(w * h), w, h, pw, ph);
    const fb = packPair(b, new Float64Array(w * h), w, h, pw, ph);
    fft2d(fa, pw, ph);
    fft2d(fb, pw, ph);
    for (let i = 0; i < cross.length; i += 2) {
      const re = (fb[i] as number) * (fa[i] as number) + (fb[i + 1] as number) * (fa[i + 1] as number);
      const im = (fb[i + 1] as number) * (fa[i] as number) - (fb[i] as number) * (fa[i + 1] as number);
      expect(cross[i]).toBeCloseTo(re, 10);
      expect(cross[i + 1]).toBeCloseTo(im, 10);
    }
  });

  it('crossCorrelateTwo gives both circular correlations on the rows it computes', () => {
    const w = 7, h = 6, pw = 16, ph = 16, reach = 4;
    const [a1, b1, a2, b2] = [11, 12, 13, 14].map((s) => randomPlane(w * h, s)) as [Float64Array, Float64Array, Float64Array, Float64Array];
    const [c1, c2] = crossCorrelateTwo([a1, b1], [a2, b2], w, h, pw, ph, reach);
    const d1 = directCorrelation(a1, b1, w, h, pw, ph);
    const d2 = directCorrelation(a2, b2, w, h, pw, ph);
    for (const row of shiftRows(ph, reach)) {
      for (let x = 0; x < pw; x++) {
        expect(c1[row * pw + x]).toBeCloseTo(d1[row * pw + x] as number, 9);
        expect(c2[row * pw + x]).toBeCloseTo(d2[row * pw + x] as number, 9);
      }
    }
  });

  it('the inverse of chosen rows equals the full inverse on those rows', () => {
    const pw = 16, ph = 8;
    const z = randomPlane(2 * pw * ph, 5);
    const full = z.slice();
    fft2d(full, pw, ph, true);
    const part = z.slice();
    const rows = shiftRows(ph, 2);
    expect(rows).toEqual([6, 7, 0, 1, 2]);
    inverseFft2dRows(part, pw, ph, rows);
    for (const r of rows) for (let i = 2 * pw * r; i < 2 * pw * (r + 1); i++) expect(part[i]).toBeCloseTo(full[i] as number, 12);
    // a reach covering half the grid or more takes every row once
    expect(shiftRows(8, 4)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
  });

  it('refuses rows marked zero on an inverse, and planes that do not fit', () => {
    expect(() => fft2d(new Float64Array(32), 4, 4, true, 2)).toThrow(RangeError);
    expect(() => packPair(new Float64Array(6), new Float64Array(6), 3, 2, 2, 2)).toThrow(RangeError);
  });
});
