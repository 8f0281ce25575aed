import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { studentTCdf, studentTQuantile, twoSidedPValue } from '@/lib/stats';

// Student t, 95% two-sided quantiles (published: NIST/SEMATECH e-Handbook §1.3.6.7.2, via docs/references.md).
describe('Student t 97.5% quantiles (published: NIST/SEMATECH e-Handbook t table)', () => {
  const table: [number, number][] = [
    [1, 12.706205],
    [2, 4.302653],
    [3, 3.182446],
    [4, 2.776445],
    [5, 2.570582],
    [9, 2.262157],
    [19, 2.093024],
  ];
  for (const [df, t] of table) {
    it(`df ${df} → ${t}`, () => {
      expect(studentTQuantile(0.975, df)).toBeCloseTo(t, 6);
      expect(studentTQuantile(0.025, df)).toBeCloseTo(-t, 6);
      // Round trip through the p-value written on the incomplete beta.
      expect(twoSidedPValue(t, df)).toBeCloseTo(0.05, 6);
    });
  }
});

describe('t distribution edge cases', () => {
  it('p is 1 at t = 0 and 0 at infinite t; the CDF is symmetric', () => {
    expect(twoSidedPValue(0, 5)).toBe(1);
    expect(twoSidedPValue(Number.POSITIVE_INFINITY, 5)).toBe(0);
    expect(studentTCdf(1.3, 7) + studentTCdf(-1.3, 7)).toBeCloseTo(1, 14);
    expect(studentTCdf(0, 7)).toBe(0.5);
  });
  it('agrees with jstat\'s own CDF where that is accurate (jstat as oracle)', () => {
    for (const [t, df] of [
      [0.5, 3],
      [-2.1, 12.5],
      [3.3, 40],
    ] as const) {
      // jstat's continued fraction stops at a 3e-7 relative step, so both agree to about 1e-8.
      expect(studentTCdf(t, df)).toBeCloseTo(jStat.studentt.cdf(t, df), 7);
    }
  });
  it('keeps tiny p-values that 1 − CDF would lose', () => {
    const p = twoSidedPValue(-40, 100);
    expect(p).toBeGreaterThan(0);
    expect(p).toBeLessThan(1e-50);
  });
  it('refuses df ≤ 0, NaN and p outside (0, 1)', () => {
    expect(() => studentTQuantile(0.975, 0)).toThrow(RangeError);
    expect(() => studentTQuantile(1, 5)).toThrow(RangeError);
    expect(() => studentTQuantile(Number.NaN, 5)).toThrow(RangeError);
    expect(() => twoSidedPValue(Number.NaN, 5)).toThrow(RangeError);
    expect(() => twoSidedPValue(1, -1)).toThrow(RangeError);
  });
});
