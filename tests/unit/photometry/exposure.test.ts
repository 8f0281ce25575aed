import { describe, expect, it } from 'vitest';
import { exposureFactor, exposureScales, meterLuminance } from '../../../lib/photometry';

describe('exposure normalisation — ISO 2720:1974, ISO 12232 (published; values derived)', () => {
  it('f/5.6, 1/50 s, ISO 200 collects 8.163× more than f/8, 1/100 s, ISO 100 (nominal f-numbers)', () => {
    const a = exposureFactor({ exposureTime: 1 / 100, fNumber: 8, iso: 100 }) as number;
    const b = exposureFactor({ exposureTime: 1 / 50, fNumber: 5.6, iso: 200 }) as number;
    expect(b / a).toBeCloseTo(8.163, 3);
  });

  it('scales every photo onto the on photo: E_on / E_photo', () => {
    const { scales, known } = exposureScales<'on' | 'off'>(
      { on: { exposureTime: 1 / 100, fNumber: 8, iso: 100 }, off: { exposureTime: 1 / 50, fNumber: 5.6, iso: 200 } },
      'on',
    );
    expect(known).toBe(true);
    expect(scales.on).toBe(1);
    expect(scales.off).toBeCloseTo(1 / 8.163, 4);
  });

  it('assumes equal exposure and reports which photo lacks EXIF', () => {
    const r = exposureScales<'on' | 'off'>({ on: { exposureTime: 0.01, fNumber: 8, iso: 100 }, off: { fNumber: 8 } }, 'on');
    expect(r.known).toBe(false);
    expect(r.missing).toEqual(['off']);
    expect(r.scales).toEqual({ on: 1, off: 1 });
  });

  it('ignores zero, negative and NaN tags', () => {
    expect(exposureFactor({ exposureTime: 0, fNumber: 8, iso: 100 })).toBeNull();
    expect(exposureFactor({ exposureTime: Number.NaN, fNumber: 8, iso: 100 })).toBeNull();
    expect(exposureFactor(null)).toBeNull();
  });
});

describe('reflected-light meter equation N²/t = L·S/K, K = 12.5 — ISO 2720:1974 (published; values derived)', () => {
  it('f/16, 1/125 s, ISO 100 → 4000 cd/m²', () => {
    expect(meterLuminance(1 / 125, 16, 100)).toBeCloseTo(4000, 6);
  });

  it('EV100 10 → 128 cd/m² (L = 2^(EV − 3))', () => {
    // EV 10 at f/1: t = 1/1024 s
    expect(meterLuminance(1 / 1024, 1, 100)).toBeCloseTo(128, 9);
  });

  it('f/2.8, 1/60 s, ISO 400 → 14.7 cd/m²', () => {
    expect(meterLuminance(1 / 60, 2.8, 400)).toBeCloseTo(14.7, 1);
  });

  it('refuses non-positive settings', () => {
    expect(() => meterLuminance(0, 8, 100)).toThrow(RangeError);
  });
});
