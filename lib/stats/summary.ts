import { assertFinite, assertLevel, assertValues } from './assert';
import { mean } from './mean';
import { standardDeviation } from './standard-deviation';
import { studentTQuantile } from './t-distribution';

/** A group's size, mean and sample standard deviation: enough for every test here. */
export interface Moments {
  n: number;
  mean: number;
  /** Sample SD (n − 1 denominator); null for a single value. */
  sd: number | null;
}

/** A confidence interval around an estimate. */
export interface Interval {
  low: number;
  high: number;
  /** The ± part. */
  halfWidth: number;
  level: number;
}

/** Summary of one group: n, mean, SD, standard error and the confidence interval of the mean. */
export interface GroupSummary extends Moments {
  /** Standard error of the mean, sd/√n; null for a single value. */
  se: number | null;
  /** Confidence interval of the mean (95% unless asked); null for a single value. */
  ci: Interval | null;
}

/** Confidence interval of a mean with Student's t: mean ± t_{(1+level)/2, n−1}·sd/√n. */
export function meanConfidenceInterval(m: Moments, level = 0.95): Interval | null {
  // Source: Student's t interval, NIST/SEMATECH e-Handbook §7.2.2.1.
  assertLevel(level);
  checkMoments(m);
  if (m.n < 2 || m.sd === null) return null;
  const halfWidth = studentTQuantile((1 + level) / 2, m.n - 1) * (m.sd / Math.sqrt(m.n));
  return { low: m.mean - halfWidth, high: m.mean + halfWidth, halfWidth, level };
}

function checkMoments(m: Moments): void {
  assertFinite('n', m.n);
  if (!Number.isInteger(m.n) || m.n < 1) throw new RangeError(`n must be a whole number ≥ 1 (got ${m.n})`);
  assertFinite('mean', m.mean);
  if (m.n >= 2) {
    if (m.sd === null) throw new RangeError('sd is required when n ≥ 2');
    assertFinite('sd', m.sd);
    if (m.sd < 0) throw new RangeError(`sd must be at least 0 (got ${m.sd})`);
  }
}

/** Summary of a group given its size, mean and SD (sd may be null when n = 1). */
export function summaryFromMoments(n: number, meanValue: number, sd: number | null, level = 0.95): GroupSummary {
  const m: Moments = { n, mean: meanValue, sd: n >= 2 ? sd : null };
  checkMoments(m);
  const se = m.sd === null ? null : m.sd / Math.sqrt(n);
  return { ...m, se, ci: meanConfidenceInterval(m, level) };
}

/** Summary of a group from its raw values. */
export function summarise(values: ArrayLike<number>, level = 0.95): GroupSummary {
  assertValues(values, 1);
  const sd = values.length >= 2 ? standardDeviation(values) : null;
  return summaryFromMoments(values.length, mean(values), sd, level);
}

/** Raw values or an already summarised group. */
export type GroupInput = ArrayLike<number> | Moments;

/** Moments of either kind of group input. */
export function toMoments(group: GroupInput): Moments {
  if ('n' in group && 'mean' in group) {
    checkMoments(group);
    return { n: group.n, mean: group.mean, sd: group.n >= 2 ? group.sd : null };
  }
  const s = summarise(group);
  return { n: s.n, mean: s.mean, sd: s.sd };
}
