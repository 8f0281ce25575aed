import { converter } from 'culori';
import { describe, expect, it } from 'vitest';
import { linearRgbToXyz, linearTable, srgb8Table, srgbDecode, srgbEncode } from '../../../lib/photometry';
import { seededRandom } from '../../fixtures/capture-generator';

describe('sRGB decoding — IEC 61966-2-1:1999 (published; values derived)', () => {
  const table: [number, number][] = [
    [0, 0],
    [1, 0.000303527],
    [10, 0.0030352698],
    [11, 0.0033465358],
    [64, 0.0512694584],
    [128, 0.2158605001],
    [188, 0.502886458],
    [255, 1],
  ];
  it.each(table)('maps 8-bit code %i to linear %f through the lookup table', (code, linear) => {
    expect(srgb8Table()[code]).toBeCloseTo(linear, 9);
  });

  it('decodes V = 0.5 to 0.2140411405 with the formula', () => {
    expect(srgbDecode(0.5)).toBeCloseTo(0.2140411405, 10);
  });

  it('encodes 0.18 to 0.4613561295 and 0.5 to 0.7353569831', () => {
    expect(srgbEncode(0.18)).toBeCloseTo(0.4613561295, 10);
    expect(srgbEncode(0.5)).toBeCloseTo(0.7353569831, 10);
  });

  it('has branches that meet within about 2.3e-9 at the joint', () => {
    expect(Math.abs(0.04045 / 12.92 - Math.pow((0.04045 + 0.055) / 1.055, 2.4))).toBeLessThan(3e-9);
  });

  it('round-trips every 16-bit code through encode within one code', () => {
    const t = linearTable(16, 'srgb');
    for (let v = 0; v <= 65535; v += 97) expect(Math.abs(srgbEncode(t[v] as number) * 65535 - v)).toBeLessThan(1e-6 * 65535);
  });

  it('treats a linear 16-bit table as code / 65535', () => {
    expect(linearTable(16, 'linear')[32768]).toBeCloseTo(32768 / 65535, 12);
  });

  it('refuses a bit depth other than 8 or 16', () => {
    expect(() => linearTable(12 as 8, 'srgb')).toThrow(RangeError);
  });
});

describe('independent oracle: culori agrees on sRGB → linear and → XYZ (D65)', () => {
  const toLinear = converter('lrgb');
  const toXyz = converter('xyz65');
  const rand = seededRandom(2024);
  const colours = Array.from({ length: 300 }, () => [rand(), rand(), rand()] as const);

  it('matches culori lrgb on 300 random colours', () => {
    for (const [r, g, b] of colours) {
      const o = toLinear({ mode: 'rgb', r, g, b });
      expect(srgbDecode(r)).toBeCloseTo(o.r, 9);
      expect(srgbDecode(g)).toBeCloseTo(o.g, 9);
      expect(srgbDecode(b)).toBeCloseTo(o.b, 9);
    }
  });

  it('matches culori xyz65 on 300 random colours within the 4-decimal matrix rounding', () => {
    for (const [r, g, b] of colours) {
      const o = toXyz({ mode: 'rgb', r, g, b });
      const x = linearRgbToXyz(srgbDecode(r), srgbDecode(g), srgbDecode(b));
      expect(Math.abs(x.x - o.x)).toBeLessThan(2e-4);
      expect(Math.abs(x.y - o.y)).toBeLessThan(2e-4);
      expect(Math.abs(x.z - o.z)).toBeLessThan(2e-4);
    }
  });
});
