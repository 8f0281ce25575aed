import { describe, expect, it } from 'vitest';
import { LUMINANCE_WEIGHTS, relativeLuminance, srgb8Table, luminanceTables, downsampleLuminance } from '../../../lib/photometry';

const lin = (v: number): number => srgb8Table()[v] as number;

describe('relative luminance — ITU-R BT.709 primaries (published)', () => {
  it('uses the weights 0.2126, 0.7152, 0.0722, the Y row of the sRGB matrix', () => {
    expect(LUMINANCE_WEIGHTS).toEqual({ r: 0.2126, g: 0.7152, b: 0.0722 });
    expect(LUMINANCE_WEIGHTS.r + LUMINANCE_WEIGHTS.g + LUMINANCE_WEIGHTS.b).toBeCloseTo(1, 12);
  });

  it('gives 0.2158605 for 8-bit grey 128 (derived)', () => {
    expect(relativeLuminance(lin(128), lin(128), lin(128))).toBeCloseTo(0.2158605, 7);
  });

  it('gives 0.2126 for 8-bit (255, 0, 0) (derived)', () => {
    expect(relativeLuminance(lin(255), lin(0), lin(0))).toBeCloseTo(0.2126, 10);
  });

  it('gives 0.083603 for 8-bit (128, 64, 32) (derived), not the luma of the encoded values', () => {
    expect(relativeLuminance(lin(128), lin(64), lin(32))).toBeCloseTo(0.083603, 6);
    const luma = relativeLuminance(128 / 255, 64 / 255, 32 / 255);
    expect(Math.abs(luma - 0.083603)).toBeGreaterThan(0.1);
  });

  it('folds the weights into per-channel tables that sum to the same luminance', () => {
    const t = luminanceTables(8, 'srgb');
    expect((t.r[128] as number) + (t.g[64] as number) + (t.b[32] as number)).toBeCloseTo(0.083603, 6);
    expect(t.clipCode).toBe(250);
    expect(luminanceTables(16, 'srgb').clipCode).toBe(64225);
  });
});

describe('downsampleLuminance', () => {
  it('handles a 1 × 1 photo', () => {
    const p = downsampleLuminance({ data: new Uint8Array([128, 128, 128]), width: 1, height: 1, channels: 3, bitDepth: 8, encoding: 'srgb' }, 1);
    expect(p.width).toBe(1);
    expect(p.data[0]).toBeCloseTo(0.2158605, 6);
  });

  it('averages odd-sized photos in full blocks and drops the partial edge', () => {
    const data = new Uint8Array(5 * 3).fill(255);
    const p = downsampleLuminance({ data, width: 5, height: 3, channels: 1, bitDepth: 8, encoding: 'srgb' }, 2);
    expect([p.width, p.height]).toEqual([2, 1]);
    expect(p.data[0]).toBeCloseTo(1, 6);
  });

  it('rejects data whose length does not match the size', () => {
    expect(() => downsampleLuminance({ data: new Uint8Array(5), width: 2, height: 1, channels: 3, bitDepth: 8, encoding: 'srgb' }, 1)).toThrow(RangeError);
  });
});
