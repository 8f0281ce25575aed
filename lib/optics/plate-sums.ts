import { assertFraction, assertRange, SUM_TOLERANCE } from './assert';
import { fresnelReflectance } from './fresnel';

/** Total reflectance and transmittance of a thick plate. */
export interface PlateSums {
  R: number;
  T: number;
}

/**
 * Incoherent sum of all multiple reflections in a thick plate: front face (R1, T1), back face
 * (R2, T2), single-pass internal transmittance ti (1 = no absorption). The plate is thick
 * compared with the coherence length, so powers add rather than amplitudes.
 */
export function plateSums(R1: number, T1: number, R2: number, T2: number, ti = 1): PlateSums {
  // Source: geometric series of incoherent internal reflections, E. Hecht, Optics, §9.7 (plate losses).
  assertFraction('R1', R1);
  assertFraction('T1', T1);
  assertFraction('R2', R2);
  assertFraction('T2', T2);
  assertRange('ti', ti, 0, 1);
  if (R1 + T1 > 1 + SUM_TOLERANCE) throw new RangeError(`R1 + T1 must not exceed 1 (got ${R1 + T1})`);
  if (R2 + T2 > 1 + SUM_TOLERANCE) throw new RangeError(`R2 + T2 must not exceed 1 (got ${R2 + T2})`);
  const round = R1 * R2 * ti * ti;
  // A plate with both faces totally reflecting traps the light: nothing comes out the back.
  const denom = 1 - round;
  if (denom <= 0) return { R: R1, T: 0 };
  return {
    R: R1 + (T1 * T1 * R2 * ti * ti) / denom,
    T: (T1 * T2 * ti) / denom,
  };
}

/** Thick uncoated plate, per polarisation and unpolarised. */
export interface PolarisedPlate {
  s: PlateSums;
  p: PlateSums;
  unpolarised: PlateSums;
}

/**
 * Both faces of an uncoated plate of index n in air at an angle of incidence in degrees,
 * summed per polarisation before averaging: averaging the face reflectances first gives a wrong
 * answer because the plate formula is not linear in R.
 */
export function uncoatedPlate(angleDeg: number, n: number, ti = 1): PolarisedPlate {
  // Source: Fresnel equations (E. Hecht, Optics) with the incoherent plate series; the inner face
  // sees the refracted angle, and by reciprocity its reflectance equals the outer face's.
  const face = fresnelReflectance(angleDeg, n);
  const s = plateSums(face.s, 1 - face.s, face.s, 1 - face.s, ti);
  const p = plateSums(face.p, 1 - face.p, face.p, 1 - face.p, ti);
  return { s, p, unpolarised: { R: (s.R + p.R) / 2, T: (s.T + p.T) / 2 } };
}
