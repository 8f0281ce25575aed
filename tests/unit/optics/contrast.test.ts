import { describe, expect, it } from 'vitest';
import { contrastCurve, logGrid, predictedContrastRatio, requiredDisplayAtEye } from '@/lib/optics';

// See-through contrast ratio (docs/references.md Contrast definitions; common practice in HUD work).
describe('predicted ambient contrast ratio (docs/references.md contrast definitions; common practice, values derived)', () => {
  it('gives CR 1.2 for 200 cd/m² of display over 1000 cd/m² of background (L_on 1200 / L_off 1000)', () => {
    expect(predictedContrastRatio(1, 200, 1, 1000)).toBeCloseTo(1.2, 12);
    expect(predictedContrastRatio(0.2, 1000, 0.5, 2000)).toBeCloseTo(1.2, 12);
  });
  it('needs 5,482 cd/m² at the eye for CR 1.2 behind τ 0.8 against 10,000 fL (34,262.6 cd/m²) — derived; the 1.2:1 figure itself is from memory', () => {
    const bg = 10_000 * 3.4262591;
    const need = requiredDisplayAtEye(1.2, 0.8, bg);
    expect(Math.round(need)).toBe(5482);
    expect(predictedContrastRatio(1, need, 0.8, bg)).toBeCloseTo(1.2, 12);
  });
  it('is 1 with no display light and infinite with an opaque see-through path', () => {
    expect(predictedContrastRatio(0.5, 0, 0.5, 100)).toBe(1);
    expect(predictedContrastRatio(0.5, 100, 0, 100)).toBe(Number.POSITIVE_INFINITY);
  });
  it('refuses a zero or NaN background and fractions outside 0…1', () => {
    expect(() => predictedContrastRatio(0.5, 100, 0.5, 0)).toThrow(RangeError);
    expect(() => predictedContrastRatio(0.5, 100, 0.5, Number.NaN)).toThrow(RangeError);
    expect(() => predictedContrastRatio(1.5, 100, 0.5, 10)).toThrow(RangeError);
    expect(() => requiredDisplayAtEye(0.9, 0.5, 10)).toThrow(RangeError);
  });
});

describe('contrast curve over background luminance', () => {
  it('samples 10…40,000 cd/m² on a log grid, ends exact, ratios falling', () => {
    const curve = contrastCurve(0.125, 3000, 0.25);
    expect(curve).toHaveLength(61);
    expect(curve[0]?.backgroundLuminance).toBe(10);
    expect(curve.at(-1)?.backgroundLuminance).toBe(40_000);
    for (let i = 1; i < curve.length; i++) {
      const a = curve[i - 1]!;
      const b = curve[i]!;
      expect(b.backgroundLuminance / a.backgroundLuminance).toBeCloseTo(4000 ** (1 / 60), 9);
      expect(b.ratio).toBeLessThan(a.ratio);
    }
    expect(curve[0]?.ratio).toBeCloseTo(1 + (0.125 * 3000) / (0.25 * 10), 9);
  });
  it('takes a custom range and count', () => {
    expect(logGrid(1, 100, 3)).toEqual([1, 10, 100]);
    expect(contrastCurve(0.1, 100, 0.5, { min: 100, max: 1000, points: 2 })).toHaveLength(2);
  });
  it('refuses fewer than 2 points, max ≤ min and non-positive ends', () => {
    expect(() => logGrid(10, 100, 1)).toThrow(RangeError);
    expect(() => logGrid(100, 10, 5)).toThrow(RangeError);
    expect(() => logGrid(0, 10, 5)).toThrow(RangeError);
    expect(() => logGrid(1, 10, 2.5)).toThrow(RangeError);
  });
});
