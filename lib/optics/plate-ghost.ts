import { assertFraction, assertPositive, assertRange, SUM_TOLERANCE } from './assert';
import { fresnelReflectance } from './fresnel';

/** Back face of a plate beam splitter. */
export type PlateBack = { kind: 'uncoated' } | { kind: 'ar'; R: number };

/** Inputs of a plate beam splitter's ghost estimate. */
export interface PlateGhostInput {
  /** Reflectance of the coated front face. */
  R: number;
  /** Transmittance of the coated front face. */
  T: number;
  /** Angle of incidence on the plate in degrees. */
  angleDeg: number;
  /** Substrate index. */
  n: number;
  back: PlateBack;
}

/** Ghost-to-primary ratio per polarisation. */
export interface GhostRatio {
  s: number;
  p: number;
  unpolarised: number;
}

/**
 * Ghost-to-primary ratio of a single face: T_f²·R_b / R_f (the ghost crosses the front twice and
 * reflects once off the back; higher orders are smaller by a further R_f·R_b).
 */
export function ghostToPrimary(Rf: number, Tf: number, Rb: number): number {
  // Source: incoherent first-order plate ghost, docs/references.md "Plate beam splitter" (derived).
  assertFraction('Rf', Rf);
  assertFraction('Tf', Tf);
  assertFraction('Rb', Rb);
  if (Rf === 0) throw new RangeError('Rf must be greater than 0: without a primary reflection there is no ratio');
  if (Rf + Tf > 1 + SUM_TOLERANCE) throw new RangeError(`Rf + Tf must not exceed 1 (got ${Rf + Tf})`);
  return (Tf * Tf * Rb) / Rf;
}

/**
 * Ghost-to-primary ratio of a plate beam splitter with a coated front and an uncoated or
 * AR-coated back, for s, p and unpolarised light. An uncoated back follows the Fresnel equations
 * at the plate's angle; an AR coat is taken as one residual reflectance for both polarisations.
 */
export function plateGhost(input: PlateGhostInput): GhostRatio {
  assertRange('angleDeg', input.angleDeg, 0, 89.999);
  assertPositive('n', input.n);
  let rbS: number;
  let rbP: number;
  if (input.back.kind === 'uncoated') {
    // The inner face sees the refracted angle from glass to air; by reciprocity its reflectance
    // equals that of the outer face at the outer angle, so no TIR can occur here.
    const face = fresnelReflectance(input.angleDeg, input.n);
    rbS = face.s;
    rbP = face.p;
  } else {
    rbS = input.back.R;
    rbP = input.back.R;
  }
  const s = ghostToPrimary(input.R, input.T, rbS);
  const p = ghostToPrimary(input.R, input.T, rbP);
  // The coating's R is one value for both polarisations, so the primaries are equal and the
  // unpolarised ratio is the plain mean.
  return { s, p, unpolarised: (s + p) / 2 };
}
