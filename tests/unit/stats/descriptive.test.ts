import { describe, expect, it } from 'vitest';
import { mean, meanConfidenceInterval, standardDeviation, summarise, summaryFromMoments, variance } from '@/lib/stats';

// NIST StRD univariate datasets (published, public domain) — docs/references.md Numerical accuracy.
describe('mean and SD against NIST StRD (published: NIST StRD univariate NumAcc1, NumAcc4)', () => {
  it('NumAcc1 {10000001, 10000003, 10000002}: mean 10000002, SD 1', () => {
    const x = [10000001, 10000003, 10000002];
    expect(mean(x)).toBe(10000002);
    expect(standardDeviation(x)).toBeCloseTo(1, 12);
  });
  it('NumAcc4: 10000000.2 then 500 pairs of (10000000.1, 10000000.3): mean 10000000.2, SD 0.1', () => {
    const x = [10000000.2];
    for (let i = 0; i < 500; i++) x.push(10000000.1, 10000000.3);
    expect(x).toHaveLength(1001);
    expect(Math.abs(mean(x) - 10000000.2)).toBeLessThan(1e-8);
    // Certified to 15 digits, but 10000000.1 itself is stored with an error near 1e-9 (one ulp at
    // 1e7 is 1.9e-9), so about 8 digits of the SD are all that Float64 input allows.
    expect(Math.abs(standardDeviation(x) - 0.1) / 0.1).toBeLessThan(1e-7);
  });
  it('the textbook one-pass formula fails NumAcc4 where this one passes (so the check can fail)', () => {
    const x = [10000000.2];
    for (let i = 0; i < 500; i++) x.push(10000000.1, 10000000.3);
    let s = 0;
    let ss = 0;
    for (const v of x) {
      s += v;
      ss += v * v;
    }
    const naive = Math.sqrt(Math.max(0, (ss - (s * s) / x.length) / (x.length - 1)));
    expect(Math.abs(naive - 0.1) / 0.1).toBeGreaterThan(1e-6);
  });
  it('works on a Float64Array', () => {
    expect(mean(new Float64Array([1, 2, 3, 4]))).toBe(2.5);
  });
});

describe('descriptive edge cases', () => {
  it('gives a mean but no SD or CI for a single value', () => {
    const s = summarise([4.2]);
    expect(s).toEqual({ n: 1, mean: 4.2, sd: null, se: null, ci: null });
    expect(() => standardDeviation([4.2])).toThrow(RangeError);
  });
  it('gives SD 0 and a zero-width CI for identical values', () => {
    const s = summarise([7, 7, 7, 7]);
    expect(s.sd).toBe(0);
    expect(variance([7, 7, 7, 7])).toBe(0);
    expect(s.ci?.halfWidth).toBe(0);
  });
  it('refuses an empty list, NaN and infinity with a RangeError', () => {
    expect(() => mean([])).toThrow(RangeError);
    expect(() => mean([1, Number.NaN])).toThrow(RangeError);
    expect(() => summarise([1, Number.POSITIVE_INFINITY])).toThrow(RangeError);
    expect(() => summaryFromMoments(3, Number.NaN, 1)).toThrow(RangeError);
    expect(() => summaryFromMoments(3, 1, -1)).toThrow(RangeError);
    expect(() => summaryFromMoments(2.5, 1, 1)).toThrow(RangeError);
    expect(() => summaryFromMoments(0, 1, 1)).toThrow(RangeError);
    expect(() => summaryFromMoments(3, 1, null)).toThrow(RangeError);
  });
});

// Derived CI (docs/references.md Statistics, NIST/SEMATECH e-Handbook; derived): 100, 102, 101 → 101 ± 2.484138.
describe('95% confidence interval with Student t (NIST/SEMATECH e-Handbook; derived)', () => {
  it('100, 102, 101 → mean 101 ± 2.484138', () => {
    const s = summarise([100, 102, 101]);
    expect(s.mean).toBe(101);
    expect(s.sd).toBeCloseTo(1, 12);
    expect(s.ci?.halfWidth).toBeCloseTo(2.484138, 6);
    expect(s.ci?.low).toBeCloseTo(101 - 2.484138, 6);
    expect(s.ci?.high).toBeCloseTo(101 + 2.484138, 6);
  });
  it('gives the same from (n, mean, sd) as from raw values', () => {
    const raw = summarise([3.1, 2.9, 3.4, 3.0, 3.3]);
    const fromMoments = summaryFromMoments(raw.n, raw.mean, raw.sd);
    expect(fromMoments.ci?.halfWidth).toBeCloseTo(raw.ci!.halfWidth, 14);
  });
  it('narrows at a lower level and refuses levels outside (0, 1)', () => {
    const m = { n: 5, mean: 0, sd: 1 };
    expect(meanConfidenceInterval(m, 0.9)!.halfWidth).toBeLessThan(meanConfidenceInterval(m)!.halfWidth);
    expect(() => meanConfidenceInterval(m, 1)).toThrow(RangeError);
    expect(() => meanConfidenceInterval(m, Number.NaN)).toThrow(RangeError);
  });
});
