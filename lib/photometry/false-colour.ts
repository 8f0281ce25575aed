import type { Plane } from './types';

// Veilmeter's own ramp: deep blue through teal and amber to near-white, monotonic in lightness
// so the map still reads in greyscale print.
const STOPS: ReadonlyArray<readonly [number, number, number, number]> = [
  [0, 12, 14, 48],
  [0.25, 28, 70, 140],
  [0.5, 36, 150, 140],
  [0.75, 230, 170, 60],
  [1, 252, 246, 220],
];

/** RGB of the ramp at t in 0..1. */
export function rampColour(t: number): [number, number, number] {
  const u = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0;
  for (let i = 1; i < STOPS.length; i++) {
    const a = STOPS[i - 1] as readonly [number, number, number, number];
    const b = STOPS[i] as readonly [number, number, number, number];
    if (u <= b[0]) {
      const k = (u - a[0]) / (b[0] - a[0]);
      return [Math.round(a[1] + k * (b[1] - a[1])), Math.round(a[2] + k * (b[2] - a[2])), Math.round(a[3] + k * (b[3] - a[3]))];
    }
  }
  return [252, 246, 220];
}

/** Interleaved 8-bit RGB of a plane mapped linearly from [min, max] onto the ramp; NaN is black. */
export function falseColour(plane: Plane, min: number, max: number): Uint8Array {
  if (!Number.isFinite(min) || !Number.isFinite(max) || !(max > min)) throw new RangeError('falseColour needs finite min < max');
  const lut = new Uint8Array(256 * 3);
  for (let i = 0; i < 256; i++) lut.set(rampColour(i / 255), 3 * i);
  const out = new Uint8Array(plane.width * plane.height * 3);
  const k = 255 / (max - min);
  const data = plane.data;
  for (let i = 0, o = 0, n = data.length; i < n; i++, o += 3) {
    const v = data[i] as number;
    if (v !== v) continue;
    // Math.round of the position clamped to 0..255, kept in integers (a float index is slow)
    let q = (v - min) * k + 0.5;
    q = q > 0 ? (q < 255 ? q : 255) : 0;
    const j = (q | 0) * 3;
    out[o] = lut[j] as number;
    out[o + 1] = lut[j + 1] as number;
    out[o + 2] = lut[j + 2] as number;
  }
  return out;
}
