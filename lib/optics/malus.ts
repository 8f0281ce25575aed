import { assertFinite, DEG } from './assert';

/** Malus's law: the fraction cos²θ of linearly polarised light an ideal polariser passes at angle θ (degrees) to its axis. */
export function malus(angleDeg: number): number {
  // Source: Malus's law, I = I0·cos²θ (E. Hecht, Optics, §8.2).
  assertFinite('angleDeg', angleDeg);
  const c = Math.cos(angleDeg * DEG);
  return c * c;
}
