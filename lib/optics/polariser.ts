import { assertFinite, assertFraction, DEG } from './assert';

function assertPrincipal(T1: number, T2: number): void {
  assertFraction('T1', T1);
  assertFraction('T2', T2);
  if (T2 > T1) throw new RangeError(`T2 (across the axis) must not exceed T1 (along the axis): got T1 ${T1}, T2 ${T2}`);
}

/** Transmittance of unpolarised light through one polariser sheet with principal transmittances T1 ≥ T2: (T1 + T2)/2. */
export function polariserSingleTransmittance(T1: number, T2: number): number {
  // Source: polariser definitions after the Handbook of Optics (published).
  assertPrincipal(T1, T2);
  return (T1 + T2) / 2;
}

/** Degree of polarisation (T1 − T2)/(T1 + T2) of the light a polariser makes from unpolarised light. */
export function polariserDegreeOfPolarisation(T1: number, T2: number): number {
  // Source: polariser definitions after the Handbook of Optics (published).
  assertPrincipal(T1, T2);
  if (T1 + T2 === 0) throw new RangeError('T1 + T2 must be greater than 0: an opaque sheet has no degree of polarisation');
  return (T1 - T2) / (T1 + T2);
}

/** Extinction ratio T2/T1 of a polariser (0 for an ideal one). */
export function polariserExtinctionRatio(T1: number, T2: number): number {
  // Source: polariser definitions after the Handbook of Optics (published).
  assertPrincipal(T1, T2);
  if (T1 === 0) throw new RangeError('T1 must be greater than 0');
  return T2 / T1;
}

/**
 * Transmittance of a real polariser for fully linearly polarised light arriving at angleDeg to
 * its axis: T1·cos²θ + T2·sin²θ (Malus's law for both principal components).
 */
export function polariserPolarisedTransmittance(T1: number, T2: number, angleDeg: number): number {
  // Source: Malus's law applied to both principal transmittances (E. Hecht, Optics, §8.2).
  assertPrincipal(T1, T2);
  assertFinite('angleDeg', angleDeg);
  const c = Math.cos(angleDeg * DEG);
  const s = Math.sin(angleDeg * DEG);
  return T1 * c * c + T2 * s * s;
}
