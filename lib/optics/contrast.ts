import { assertFinite, assertFraction, assertPositive } from './assert';

/**
 * Predicted ambient contrast ratio CR = 1 + η·L_display / (τ·L_background): (display + background)
 * over background, as seen through the stack.
 */
export function predictedContrastRatio(eta: number, displayLuminance: number, tau: number, backgroundLuminance: number): number {
  // Source: see-through contrast ratio (L_display + L_background)/L_background, docs/references.md (common practice).
  assertFraction('eta', eta);
  assertFinite('displayLuminance', displayLuminance);
  if (displayLuminance < 0) throw new RangeError(`displayLuminance must be at least 0 (got ${displayLuminance})`);
  assertFraction('tau', tau);
  assertPositive('backgroundLuminance', backgroundLuminance);
  if (tau === 0) return Number.POSITIVE_INFINITY;
  return 1 + (eta * displayLuminance) / (tau * backgroundLuminance);
}

/**
 * Display luminance needed at the eye (η·L_display, cd/m²) to reach a target contrast ratio against
 * a background seen through a transmission τ: (CR − 1)·τ·L_background.
 */
export function requiredDisplayAtEye(targetRatio: number, tau: number, backgroundLuminance: number): number {
  // Source: the contrast ratio above solved for the display term (derived).
  assertFinite('targetRatio', targetRatio);
  if (targetRatio < 1) throw new RangeError(`targetRatio must be at least 1 (got ${targetRatio})`);
  assertFraction('tau', tau);
  assertPositive('backgroundLuminance', backgroundLuminance);
  return (targetRatio - 1) * tau * backgroundLuminance;
}

/** One point of a contrast curve. */
export interface ContrastPoint {
  backgroundLuminance: number;
  ratio: number;
}

/** Options of a sampled contrast curve. */
export interface ContrastCurveOptions {
  /** Lowest background luminance in cd/m² (default 10). */
  min?: number;
  /** Highest background luminance in cd/m² (default 40,000). */
  max?: number;
  /** Number of samples, log-spaced, both ends included (default 61). */
  points?: number;
}

/** Background luminances log-spaced from min to max, both included. */
export function logGrid(min: number, max: number, points: number): number[] {
  assertPositive('min', min);
  assertPositive('max', max);
  if (max <= min) throw new RangeError(`max must be greater than min (got ${min}…${max})`);
  if (!Number.isInteger(points) || points < 2 || points > 10_000) {
    throw new RangeError(`points must be a whole number from 2 to 10000 (got ${points})`);
  }
  const a = Math.log10(min);
  const step = (Math.log10(max) - a) / (points - 1);
  // Ends are set exactly so that the axis labels 10 and 40,000 land on samples.
  return Array.from({ length: points }, (_, i) => (i === 0 ? min : i === points - 1 ? max : 10 ** (a + i * step)));
}

/** The predicted contrast ratio sampled over background luminance on a log grid (10…40,000 cd/m² by default). */
export function contrastCurve(
  eta: number,
  displayLuminance: number,
  tau: number,
  options: ContrastCurveOptions = {},
): ContrastPoint[] {
  const grid = logGrid(options.min ?? 10, options.max ?? 40_000, options.points ?? 61);
  return grid.map((backgroundLuminance) => ({
    backgroundLuminance,
    ratio: predictedContrastRatio(eta, displayLuminance, tau, backgroundLuminance),
  }));
}
