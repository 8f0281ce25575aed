import { assertFinite, assertFraction, DEG } from './assert';

/**
 * Partially linearly polarised light as its first three Stokes parameters: s0 is the power,
 * s1 and s2 the linear parts along 0°/90° and ±45°. Circular light is outside this model.
 */
export interface LightState {
  s0: number;
  s1: number;
  s2: number;
}

/** Unpolarised light of the given power. */
export function unpolarisedLight(power = 1): LightState {
  assertFinite('power', power);
  if (power < 0) throw new RangeError(`power must be at least 0 (got ${power})`);
  return { s0: power, s1: 0, s2: 0 };
}

/** Fully linearly polarised light of the given power at angleDeg. */
export function linearLight(power: number, angleDeg: number): LightState {
  // Source: Stokes parameters of linear polarisation (E. Hecht, Optics, §8.12).
  assertFinite('power', power);
  assertFinite('angleDeg', angleDeg);
  if (power < 0) throw new RangeError(`power must be at least 0 (got ${power})`);
  return { s0: power, s1: power * Math.cos(2 * angleDeg * DEG), s2: power * Math.sin(2 * angleDeg * DEG) };
}

/** Degree of linear polarisation √(s1² + s2²)/s0 (0 for dark light). */
export function degreeOfLinearPolarisation(light: LightState): number {
  if (light.s0 === 0) return 0;
  return Math.hypot(light.s1, light.s2) / light.s0;
}

/** Angle of the polarised part in degrees, in (−90, 90]; null when the light has no polarised part. */
export function polarisationAngle(light: LightState): number | null {
  if (Math.hypot(light.s1, light.s2) <= 1e-15 * Math.max(light.s0, 1e-300)) return null;
  return (Math.atan2(light.s2, light.s1) * 90) / Math.PI;
}

/** One element that light crosses in a chain. */
export type ChainElement =
  | { kind: 'polariser'; T1: number; T2: number; axisDeg: number }
  | { kind: 'neutral'; T: number };

/**
 * Light after a linear polariser with principal transmittances T1 (along axisDeg) and T2
 * (across), treated as a linear diattenuator: unpolarised light leaves with (T1 + T2)/2 of its
 * power, polarised light follows Malus's law on both components.
 */
export function throughPolariser(light: LightState, T1: number, T2: number, axisDeg: number): LightState {
  // Source: Mueller matrix of a linear diattenuator (R. A. Chipman, Handbook of Optics vol. II, ch. 22).
  assertFraction('T1', T1);
  assertFraction('T2', T2);
  assertFinite('axisDeg', axisDeg);
  if (T2 > T1) throw new RangeError(`T2 must not exceed T1 (got T1 ${T1}, T2 ${T2})`);
  const c = Math.cos(2 * axisDeg * DEG);
  const s = Math.sin(2 * axisDeg * DEG);
  const sum = T1 + T2;
  const diff = T1 - T2;
  const root = 2 * Math.sqrt(T1 * T2);
  const { s0, s1, s2 } = light;
  return {
    s0: 0.5 * (sum * s0 + diff * c * s1 + diff * s * s2),
    s1: 0.5 * (diff * c * s0 + (sum * c * c + root * s * s) * s1 + (sum - root) * c * s * s2),
    s2: 0.5 * (diff * s * s0 + (sum - root) * c * s * s1 + (sum * s * s + root * c * c) * s2),
  };
}

/** Light after a chain of polarisers and neutral elements, in order. */
export function throughChain(light: LightState, chain: readonly ChainElement[]): LightState {
  let out = light;
  for (const el of chain) {
    if (el.kind === 'polariser') {
      out = throughPolariser(out, el.T1, el.T2, el.axisDeg);
    } else {
      assertFraction('T', el.T);
      out = { s0: out.s0 * el.T, s1: out.s1 * el.T, s2: out.s2 * el.T };
    }
  }
  return out;
}

/** Fraction of the input power a chain passes. */
export function chainTransmittance(light: LightState, chain: readonly ChainElement[]): number {
  if (!(light.s0 > 0)) throw new RangeError('input light must have a power greater than 0');
  return throughChain(light, chain).s0 / light.s0;
}
