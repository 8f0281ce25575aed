import { assertLevel } from './assert';
import { type GroupInput, type Interval, type Moments, toMoments } from './summary';
import { studentTQuantile, twoSidedPValue } from './t-distribution';

/** Result of a two-sample t test on the difference first − second. */
export interface TwoSampleResult {
  method: 'welch' | 'pooled';
  /** mean(first) − mean(second). */
  difference: number;
  /** Standard error of the difference. */
  se: number;
  t: number;
  df: number;
  /** Two-sided p-value. */
  p: number;
  /** Confidence interval of the difference (95% unless asked). */
  ci: Interval;
  n1: number;
  n2: number;
  /** Pooled SD (pooled test only). */
  sp?: number;
}

function needTwo(a: Moments, b: Moments): { v1: number; v2: number } {
  if (a.n < 2 || b.n < 2 || a.sd === null || b.sd === null) {
    throw new RangeError(`each group needs at least 2 values (got ${a.n} and ${b.n})`);
  }
  return { v1: a.sd * a.sd, v2: b.sd * b.sd };
}

function finish(
  method: 'welch' | 'pooled',
  a: Moments,
  b: Moments,
  se: number,
  df: number,
  level: number,
  sp?: number,
): TwoSampleResult {
  const difference = a.mean - b.mean;
  // Two groups without scatter: the difference is exact, so it is either certain or nothing.
  const t = se === 0 ? (difference === 0 ? 0 : Math.sign(difference) * Number.POSITIVE_INFINITY) : difference / se;
  const p = twoSidedPValue(t, df);
  const halfWidth = se === 0 ? 0 : studentTQuantile((1 + level) / 2, df) * se;
  const result: TwoSampleResult = {
    method,
    difference,
    se,
    t,
    df,
    p,
    ci: { low: difference - halfWidth, high: difference + halfWidth, halfWidth, level },
    n1: a.n,
    n2: b.n,
  };
  if (sp !== undefined) result.sp = sp;
  return result;
}

/**
 * Welch–Satterthwaite degrees of freedom (s1²/n1 + s2²/n2)² / ((s1²/n1)²/(n1−1) + (s2²/n2)²/(n2−1));
 * n1 + n2 − 2 when neither group scatters, where the formula is 0/0.
 */
export function welchDegreesOfFreedom(first: GroupInput, second: GroupInput): number {
  // Source: Welch–Satterthwaite equation, NIST/SEMATECH e-Handbook §1.3.5.3.
  const a = toMoments(first);
  const b = toMoments(second);
  const { v1, v2 } = needTwo(a, b);
  const q1 = v1 / a.n;
  const q2 = v2 / b.n;
  const denom = (q1 * q1) / (a.n - 1) + (q2 * q2) / (b.n - 1);
  if (denom === 0) return a.n + b.n - 2;
  return ((q1 + q2) * (q1 + q2)) / denom;
}

/** Welch's unequal-variance t test of mean(first) − mean(second), with its CI and two-sided p. */
export function welchTest(first: GroupInput, second: GroupInput, level = 0.95): TwoSampleResult {
  // Source: Welch's t, T = (Ȳ1 − Ȳ2)/√(s1²/N1 + s2²/N2), NIST/SEMATECH e-Handbook §1.3.5.3.
  assertLevel(level);
  const a = toMoments(first);
  const b = toMoments(second);
  const { v1, v2 } = needTwo(a, b);
  const se = Math.sqrt(v1 / a.n + v2 / b.n);
  return finish('welch', a, b, se, welchDegreesOfFreedom(a, b), level);
}

/** Pooled-variance (Student) t test of mean(first) − mean(second), with df = n1 + n2 − 2. */
export function pooledTest(first: GroupInput, second: GroupInput, level = 0.95): TwoSampleResult {
  // Source: pooled two-sample t, s_p² = ((N1−1)s1² + (N2−1)s2²)/(N1+N2−2), NIST/SEMATECH e-Handbook §1.3.5.3.
  assertLevel(level);
  const a = toMoments(first);
  const b = toMoments(second);
  const { v1, v2 } = needTwo(a, b);
  const df = a.n + b.n - 2;
  const sp = Math.sqrt(((a.n - 1) * v1 + (b.n - 1) * v2) / df);
  const se = sp * Math.sqrt(1 / a.n + 1 / b.n);
  return finish('pooled', a, b, se, df, level, sp);
}
