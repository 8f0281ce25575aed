import { describe, expect, it } from 'vitest';
import { fitLinearity, readGreySteps, srgbEncode, type PhotoRaster } from '../../../lib/photometry';
import { GREY_STEP_LINEAR, GREY_STEPS, greyStepAt } from '../../../lib/patterns';
import { seededRandom } from '../../fixtures/capture-generator';

/**
 * A camera's 8-bit sRGB photo of the grey-steps pattern: the display's linear steps times a gain,
 * plus flare, through an optional tone curve, with read noise, encoded by IEC 61966-2-1.
 */
function photograph(tone: (v: number) => number, opts: { gain?: number; flare?: number; noise?: number } = {}): PhotoRaster {
  const W = 440;
  const H = 120;
  const rand = seededRandom(3);
  const gain = opts.gain ?? 0.85;
  const flare = opts.flare ?? 0.004;
  const noise = opts.noise ?? 0.002;
  const data = new Uint8Array(W * H * 3);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const lin = GREY_STEP_LINEAR[greyStepAt(x, W)] as number;
      const v = tone(Math.max(0, gain * lin + flare + noise * (rand() - 0.5) * 3.46));
      const code = Math.round(255 * srgbEncode(Math.min(1, Math.max(0, v))));
      data.fill(code, 3 * (y * W + x), 3 * (y * W + x) + 3);
    }
  }
  return { data, width: W, height: H, channels: 3, bitDepth: 8, encoding: 'srgb' };
}

const check = (r: PhotoRaster) => {
  const s = readGreySteps(r, { x: 0, y: 0, w: r.width, h: r.height }, GREY_STEPS.length);
  return fitLinearity(s.levels, GREY_STEP_LINEAR, s.clipped);
};

describe('linearity check on the grey-steps pattern', () => {
  it('passes a linear camera with flare, exponent within 0.02 of 1', () => {
    const f = check(photograph((v) => v));
    expect(f.linear).toBe(true);
    expect(f.warning).toBeNull();
    expect(Math.abs(f.exponent - 1)).toBeLessThan(0.02);
    expect(f.used.length).toBe(10);
  });

  it('flags a camera that brightens shadows with a power curve (exponent 1/1.4) and gives the advice', () => {
    const f = check(photograph((v) => Math.pow(v, 1 / 1.4)));
    expect(f.linear).toBe(false);
    expect(f.exponent).toBeLessThan(0.8);
    expect(f.warning).toMatch(/tone curve/);
    expect(f.warning).toMatch(/manual mode/);
    expect(f.warning).toMatch(/HDR/);
    expect(f.warning).toMatch(/16-bit TIFF/);
  });

  it('flags an S-shaped contrast curve even where the fitted exponent looks near 1', () => {
    // smoothstep in the linear domain: shadows crushed, highlights lifted (an invented camera look)
    const f = check(photograph((v) => v * v * (3 - 2 * v), { gain: 0.95 }));
    expect(f.linear).toBe(false);
    expect(f.maxDeviation).toBeGreaterThan(0.06);
  });

  it('leaves clipped steps out of the fit', () => {
    const f = check(photograph((v) => v, { gain: 1.4 }));
    expect(f.used).not.toContain(10);
    expect(f.linear).toBe(true);
  });

  it('refuses mismatched, short or non-finite input and a pattern area too small for its steps', () => {
    expect(() => fitLinearity([1, 2, 3], [1, 2, 3])).toThrow(RangeError);
    expect(() => fitLinearity([0, 1, 2, 3, 4], [0, 1, 2, 3])).toThrow(RangeError);
    expect(() => fitLinearity([0, 1, Number.NaN, 3], [0, 1, 2, 3])).toThrow(RangeError);
    expect(() => fitLinearity([0.5, 0.5, 0.5, 0.5, 0.5], [0, 0.25, 0.5, 0.75, 1])).toThrow(/usable steps/);
    const r = photograph((v) => v);
    expect(() => readGreySteps(r, { x: 0, y: 0, w: 30, h: 10 }, 11)).toThrow(/too small/);
    expect(() => readGreySteps(r, { x: 0, y: 0, w: 1000, h: 10 }, 11)).toThrow(/inside/);
  });
});
