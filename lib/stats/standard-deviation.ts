import { assertValues } from './assert';
import { mean } from './mean';

/** Sample variance (n − 1 denominator), two-pass with the rounding correction; needs at least 2 values. */
export function variance(values: ArrayLike<number>): number {
  // Source: corrected two-pass algorithm, Chan, Golub & LeVeque, Am. Stat. 37(3), 1983, eq. 1.7.
  assertValues(values, 2);
  const n = values.length;
  const m = mean(values);
  let ss = 0;
  let s = 0;
  for (let i = 0; i < n; i++) {
    const d = (values[i] as number) - m;
    ss += d * d;
    s += d;
  }
  return Math.max(0, (ss - (s * s) / n) / (n - 1));
}

/** Sample standard deviation (n − 1 denominator); needs at least 2 values. */
export function standardDeviation(values: ArrayLike<number>): number {
  return Math.sqrt(variance(values));
}
