import { assertValues } from './assert';

/**
 * Arithmetic mean in Float64 with one correction pass, so that values sharing a large offset
 * (NIST NumAcc1, NumAcc4) keep their last digits.
 */
export function mean(values: ArrayLike<number>): number {
  // Source: corrected two-pass algorithm, Chan, Golub & LeVeque, Am. Stat. 37(3), 1983.
  assertValues(values, 1);
  const n = values.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += values[i] as number;
  const first = sum / n;
  let residual = 0;
  for (let i = 0; i < n; i++) residual += (values[i] as number) - first;
  return first + residual / n;
}
