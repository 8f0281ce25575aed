import { assertPositive } from './assert';

/**
 * Critical angle in degrees for light going from index n1 into a lower index n2; null when
 * n1 ≤ n2, since total internal reflection cannot happen then.
 */
export function criticalAngle(n1: number, n2 = 1): number | null {
  // Source: Snell's law with sin θt = 1, E. Hecht, Optics, §4.7.
  assertPositive('n1', n1);
  assertPositive('n2', n2);
  if (n1 <= n2) return null;
  return (Math.asin(n2 / n1) * 180) / Math.PI;
}
