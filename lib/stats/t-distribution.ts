import jStat from 'jstat';
import { assertFinite } from './assert';

function assertDf(df: number): void {
  assertFinite('df', df);
  if (df <= 0) throw new RangeError(`df must be greater than 0 (got ${df})`);
}

/** Quantile of Student's t distribution: the t below which a fraction p of the distribution lies (df may be fractional). */
export function studentTQuantile(p: number, df: number): number {
  // Source: Student's t inverse CDF via jstat's incomplete beta inverse (jStat.studentt.inv).
  assertFinite('p', p);
  if (p <= 0 || p >= 1) throw new RangeError(`p must be between 0 and 1, exclusive (got ${p})`);
  assertDf(df);
  return jStat.studentt.inv(p, df);
}

/**
 * Two-sided p-value of a t statistic: P(|T| ≥ |t|) = I_{df/(df+t²)}(df/2, 1/2). Written on the
 * incomplete beta directly, so tiny p-values (1e-25) keep their digits instead of becoming 1 − 1.
 */
export function twoSidedPValue(t: number, df: number): number {
  // Source: Abramowitz & Stegun 26.7.1 with 26.5.27 (Student's t as an incomplete beta).
  if (Number.isNaN(t)) throw new RangeError('t must be a number (got NaN)');
  assertDf(df);
  if (!Number.isFinite(t)) return 0;
  if (t === 0) return 1;
  const x = df / (df + t * t);
  const p = jStat.ibeta(x, df / 2, 0.5);
  if (p === false || Number.isNaN(p)) throw new RangeError(`cannot evaluate the t distribution at t ${t}, df ${df}`);
  return Math.min(1, Math.max(0, p));
}

/** Cumulative distribution of Student's t: P(T ≤ t). */
export function studentTCdf(t: number, df: number): number {
  const tail = twoSidedPValue(t, df) / 2;
  return t < 0 ? tail : 1 - tail;
}
