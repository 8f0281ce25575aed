import ttest2 from '@stdlib/stats-ttest2';
import { describe, expect, it } from 'vitest';
import { pooledTest, welchDegreesOfFreedom, welchTest } from '@/lib/stats';
import { seededRandom } from '../../fixtures/seeded-random';

const auto83a = { n: 249, mean: 20.14458, sd: 6.4147 };
const auto83b = { n: 79, mean: 30.48101, sd: 6.10771 };

// NIST/SEMATECH e-Handbook §1.3.5.3, AUTO83B (published).
describe('two-sample t tests on AUTO83B (published: NIST/SEMATECH e-Handbook §1.3.5.3)', () => {
  it('pooled: T −12.62059, s_p 6.34260, df 326', () => {
    const r = pooledTest(auto83a, auto83b);
    expect(r.t).toBeCloseTo(-12.62059, 4);
    expect(r.sp).toBeCloseTo(6.3426, 4);
    expect(r.df).toBe(326);
    expect(r.p).toBeLessThan(1e-20);
  });
  it('Welch: T −12.94627, df 136.8750, two-sided p ≈ 1.571e-25', () => {
    const r = welchTest(auto83a, auto83b);
    expect(r.t).toBeCloseTo(-12.94627, 4);
    expect(r.df).toBeCloseTo(136.875, 3);
    expect(welchDegreesOfFreedom(auto83a, auto83b)).toBeCloseTo(136.875, 3);
    expect(r.p / 1.571e-25).toBeCloseTo(1, 3);
    expect(r.difference).toBeCloseTo(20.14458 - 30.48101, 10);
    expect(r.ci.high).toBeLessThan(0);
  });
});

// NAG g07cac example (published). The inputs are rounded SDs, so the fourth decimal may differ.
describe('small-sample Welch (published: NAG Library g07cac example)', () => {
  it('n 4, mean 25, SD 0.8185 vs n 8, mean 21, SD 4.208 → t 2.5922, df 7.9925', () => {
    const r = welchTest({ n: 4, mean: 25, sd: 0.8185 }, { n: 8, mean: 21, sd: 4.208 });
    expect(Math.abs(r.t - 2.5922)).toBeLessThan(5e-4);
    expect(Math.abs(r.df - 7.9925)).toBeLessThan(5e-4);
  });
});

function normalSample(rand: () => number, n: number, mu: number, sigma: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) {
    const u = 1 - rand();
    const v = rand();
    out.push(mu + sigma * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v));
  }
  return out;
}

// Independent oracle: @stdlib/stats-ttest2 (Welch by default), used in tests only.
describe('Welch and pooled t against @stdlib/stats-ttest2 on seeded random data (oracle)', () => {
  const cases = [
    { seed: 1, n1: 5, n2: 5, mu2: 1.3, s1: 0.1, s2: 0.12 },
    { seed: 7, n1: 3, n2: 9, mu2: 1.0, s1: 0.05, s2: 0.3 },
    { seed: 42, n1: 20, n2: 14, mu2: 1.02, s1: 0.2, s2: 0.05 },
    { seed: 99, n1: 8, n2: 8, mu2: 1.0, s1: 1, s2: 1 },
  ];
  for (const c of cases) {
    it(`seed ${c.seed}: ${c.n1} vs ${c.n2} values`, () => {
      const rand = seededRandom(c.seed);
      const x = normalSample(rand, c.n1, 1, c.s1);
      const y = normalSample(rand, c.n2, c.mu2, c.s2);
      const ours = welchTest(x, y);
      const theirs = ttest2(x, y);
      expect(ours.t).toBeCloseTo(theirs.statistic, 9);
      expect(ours.df).toBeCloseTo(theirs.df, 9);
      // p goes through jstat's incomplete beta (continued fraction to a 3e-7 step): ~1e-8 agreement.
      expect(Math.abs(ours.p - theirs.pValue) / theirs.pValue).toBeLessThan(1e-6);
      // The CI uses jstat's t quantile (an iterative inverse): agreement to about 1e-8.
      expect(ours.ci.low).toBeCloseTo(theirs.ci[0]!, 7);
      expect(ours.ci.high).toBeCloseTo(theirs.ci[1]!, 7);
      const oursPooled = pooledTest(x, y);
      const theirsPooled = ttest2(x, y, { variance: 'equal' });
      expect(oursPooled.t).toBeCloseTo(theirsPooled.statistic, 9);
      expect(Math.abs(oursPooled.p - theirsPooled.pValue) / theirsPooled.pValue).toBeLessThan(1e-6);
    });
  }
});

describe('two-sample edge cases', () => {
  it('equal groups give t 0 and p 1', () => {
    const r = welchTest([1, 2, 3], [1, 2, 3]);
    expect(r.t).toBe(0);
    expect(r.p).toBe(1);
    expect(r.difference).toBe(0);
  });
  it('two groups without scatter: identical means give p 1, different means p 0', () => {
    const same = welchTest([2, 2, 2], [2, 2, 2]);
    expect(same.p).toBe(1);
    expect(same.df).toBe(4);
    const diff = welchTest([2, 2, 2], [3, 3, 3]);
    expect(diff.t).toBe(Number.NEGATIVE_INFINITY);
    expect(diff.p).toBe(0);
    expect(diff.ci.halfWidth).toBe(0);
  });
  it('refuses a group of one, NaN values and a bad level', () => {
    expect(() => welchTest([1], [1, 2, 3])).toThrow(RangeError);
    expect(() => pooledTest({ n: 1, mean: 1, sd: null }, [1, 2])).toThrow(RangeError);
    expect(() => welchTest([1, Number.NaN], [1, 2, 3])).toThrow(RangeError);
    expect(() => welchTest([1, 2], [1, 2, 3], 0)).toThrow(RangeError);
  });
});
