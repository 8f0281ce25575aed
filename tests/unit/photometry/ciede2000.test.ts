import { describe, expect, it } from 'vitest';
import { deltaE2000, linearRgbToXyz, xyzToLab, D65_WHITE } from '../../../lib/photometry';

// Sharma, Wu & Dalal, Color Res. Appl. 30(1), 2005, Table 1 (published dataset); kL = kC = kH = 1, tolerance 1e-4
const pairs: [number, [number, number, number], [number, number, number], number][] = [
  [1, [50, 2.6772, -79.7751], [50, 0, -82.7485], 2.0425],
  [2, [50, 3.1571, -77.2803], [50, 0, -82.7485], 2.8615],
  [3, [50, 2.8361, -74.02], [50, 0, -82.7485], 3.4412],
  [4, [50, -1.3802, -84.2814], [50, 0, -82.7485], 1.0],
  [7, [50, 0, 0], [50, -1, 2], 2.3669],
  [8, [50, -1, 2], [50, 0, 0], 2.3669],
  [9, [50, 2.49, -0.001], [50, -2.49, 0.0009], 7.1792],
  [13, [50, -0.001, 2.49], [50, 0.0009, -2.49], 4.8045],
  [16, [50, 2.5, 0], [50, 0, -2.5], 4.3065],
  [17, [50, 2.5, 0], [73, 25, -18], 27.1492],
  [18, [50, 2.5, 0], [61, -5, 29], 22.8977],
  [21, [50, 2.5, 0], [50, 3.1736, 0.5854], 1.0],
  [25, [60.2574, -34.0099, 36.2677], [60.4626, -34.1751, 39.4387], 1.2644],
  [28, [35.0831, -44.1164, 3.7933], [35.0232, -40.0716, 1.5901], 1.8645],
  [31, [90.8027, -2.0831, 1.441], [91.1528, -1.6435, 0.0447], 1.4441],
  [33, [6.7747, -0.2908, -2.4247], [5.8714, -0.0985, -2.2286], 0.6377],
  [34, [2.0776, 0.0795, -1.135], [0.9033, -0.0636, -0.5514], 0.9082],
];

describe('CIEDE2000 — Sharma, Wu & Dalal 2005, Table 1 (published dataset)', () => {
  it.each(pairs)('pair %i gives the published ΔE00', (_n, a, b, de) => {
    const d = deltaE2000({ l: a[0], a: a[1], b: a[2] }, { l: b[0], a: b[1], b: b[2] });
    expect(Math.abs(d - de)).toBeLessThan(1e-4);
  });

  it('is symmetric and zero for identical colours', () => {
    const c = { l: 40, a: 10, b: -20 };
    expect(deltaE2000(c, c)).toBe(0);
    expect(deltaE2000(c, { l: 45, a: 0, b: 3 })).toBeCloseTo(deltaE2000({ l: 45, a: 0, b: 3 }, c), 12);
  });

  it('pair 14 (exactly 180° apart) gives the table value 4.8045 or the other accepted 4.7461 (docs/references.md note)', () => {
    const d = deltaE2000({ l: 50, a: -0.001, b: 2.49 }, { l: 50, a: 0.0011, b: -2.49 });
    expect(Math.min(Math.abs(d - 4.8045), Math.abs(d - 4.7461))).toBeLessThan(1e-4);
  });

  it('refuses NaN', () => {
    expect(() => deltaE2000({ l: Number.NaN, a: 0, b: 0 }, { l: 0, a: 0, b: 0 })).toThrow(RangeError);
  });
});

describe('CIE Lab with the D65 white from x = 0.3127, y = 0.3290 (ITU-R BT.709; checks derived)', () => {
  // the check's red is the full-precision column derived from the BT.709 primaries and that white
  // (X 0.4123908, Y 0.2126390, Z 0.0193308); the standard's 4-decimal matrix gives L* 53.233 instead
  it('puts sRGB red at L* 53.2371, a* 80.0901, b* 67.2033', () => {
    const lab = xyzToLab({ x: 0.4123908, y: 0.212639, z: 0.0193308 });
    expect(lab.l).toBeCloseTo(53.2371, 3);
    expect(lab.a).toBeCloseTo(80.0901, 3);
    expect(lab.b).toBeCloseTo(67.2033, 3);
  });

  it('puts the 4-decimal matrix red within 0.005 of those values', () => {
    const lab = xyzToLab(linearRgbToXyz(1, 0, 0));
    expect(Math.abs(lab.l - 53.2371)).toBeLessThan(0.005);
    expect(Math.abs(lab.a - 80.0901)).toBeLessThan(0.05);
  });

  it('puts Y = 0.18 at L* 49.4961', () => {
    expect(xyzToLab({ x: 0.18 * D65_WHITE.x, y: 0.18, z: 0.18 * D65_WHITE.z }).l).toBeCloseTo(49.4961, 4);
  });

  it('maps the white itself to a* = b* = 0', () => {
    const lab = xyzToLab(D65_WHITE);
    expect(lab.l).toBeCloseTo(100, 10);
    expect(Math.abs(lab.a)).toBeLessThan(1e-10);
    expect(Math.abs(lab.b)).toBeLessThan(1e-10);
  });
});
