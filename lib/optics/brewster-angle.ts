import { assertPositive } from './assert';

/** Brewster angle in degrees, where p-polarised light is not reflected: atan(n2/n1). */
export function brewsterAngle(n2: number, n1 = 1): number {
  // Source: Brewster's law, E. Hecht, Optics, §8.6.
  assertPositive('n2', n2);
  assertPositive('n1', n1);
  return (Math.atan(n2 / n1) * 180) / Math.PI;
}
