import { assertPositive, assertRange, DEG } from './assert';

/** Reflectance of one smooth interface for s, p and unpolarised light. */
export interface PolarisedReflectance {
  s: number;
  p: number;
  /** Mean of s and p: unpolarised light carries equal power in both. */
  unpolarised: number;
}

/**
 * Fresnel power reflectances of a smooth interface from a medium of index n1 into n2, for an
 * angle of incidence in degrees (0 = normal, 90 = grazing). Beyond the critical angle every
 * polarisation is totally reflected.
 */
export function fresnelReflectance(angleDeg: number, n2: number, n1 = 1): PolarisedReflectance {
  // Source: Fresnel equations, E. Hecht, Optics, §4.6 (amplitude ratios squared).
  assertRange('angleDeg', angleDeg, 0, 90);
  assertPositive('n2', n2);
  assertPositive('n1', n1);
  const cosI = Math.cos(angleDeg * DEG);
  const sinI = Math.sin(angleDeg * DEG);
  const sinT = (n1 / n2) * sinI;
  if (sinT >= 1) return { s: 1, p: 1, unpolarised: 1 };
  const cosT = Math.sqrt(1 - sinT * sinT);
  const rs = (n1 * cosI - n2 * cosT) / (n1 * cosI + n2 * cosT);
  const rp = (n1 * cosT - n2 * cosI) / (n1 * cosT + n2 * cosI);
  const s = rs * rs;
  const p = rp * rp;
  return { s, p, unpolarised: (s + p) / 2 };
}

/** Fresnel reflectance for s-polarised light (electric field perpendicular to the plane of incidence). */
export function fresnelRs(angleDeg: number, n2: number, n1 = 1): number {
  return fresnelReflectance(angleDeg, n2, n1).s;
}

/** Fresnel reflectance for p-polarised light (electric field in the plane of incidence). */
export function fresnelRp(angleDeg: number, n2: number, n1 = 1): number {
  return fresnelReflectance(angleDeg, n2, n1).p;
}

/** Fresnel reflectance at normal incidence, ((n1 − n2)/(n1 + n2))², the same for every polarisation. */
export function normalIncidenceReflectance(n2: number, n1 = 1): number {
  // Source: Fresnel equations at θ = 0, E. Hecht, Optics, §4.6.
  assertPositive('n2', n2);
  assertPositive('n1', n1);
  const r = (n1 - n2) / (n1 + n2);
  return r * r;
}
