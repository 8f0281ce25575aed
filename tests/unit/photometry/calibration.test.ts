import { describe, expect, it } from 'vitest';
import { decodePhoto } from '../../../lib/image/decode';
import { absoluteLuminance, analyzeCapture, calibrateFromPatch, calibrationFactor, exposureFactor, meterLuminance, METER_K, roughCalibrationFactor, type PhotoRaster } from '../../../lib/photometry';
import { renderCapture, type ExposureSetting } from '../../fixtures/capture-generator';

describe('meter equation constants — ISO 2720:1974 (published; values derived)', () => {
  // the three check values of docs/references.md are tested in exposure.test.ts; these extend them
  it('uses K = 12.5, inside the 10.6–13.4 the standard allows', () => {
    expect(METER_K).toBe(12.5);
    expect(METER_K).toBeGreaterThanOrEqual(10.6);
    expect(METER_K).toBeLessThanOrEqual(13.4);
  });

  it('follows L = 2^(EV − 3) cd/m² at ISO 100 for EV 6, 10 and 15', () => {
    for (const ev of [6, 10, 15]) expect(meterLuminance(1 / 2 ** ev, 1, 100)).toBeCloseTo(2 ** (ev - 3), 6);
  });

  it('scales with K: K = 14 (also in use) reads 14/12.5 higher at f/16, 1/125 s, ISO 100 → 4480 cd/m²', () => {
    expect(meterLuminance(1 / 125, 16, 100, 14)).toBeCloseTo(4480, 6);
  });

  it('gives the rough estimate a settings-free k = K/0.18 ≈ 69.44 (18% mid-tone: common practice)', () => {
    expect(roughCalibrationFactor()).toBeCloseTo(12.5 / 0.18, 12);
    // k·Y/E at Y = 0.18 reproduces the meter equation for any settings
    for (const [t, n, s] of [[1 / 125, 16, 100], [1 / 60, 2.8, 400]] as const) {
      const e = (t * s) / (n * n);
      expect(absoluteLuminance(roughCalibrationFactor(), 0.18, e)).toBeCloseTo(meterLuminance(t, n, s), 9);
    }
  });
});

describe('camera calibration: k = L·E/Y (docs/method.md §5.4)', () => {
  it('inverts the conversion exactly', () => {
    const k = calibrationFactor(250, 0.4, 0.015625);
    expect(absoluteLuminance(k, 0.4, 0.015625)).toBeCloseTo(250, 12);
  });

  it('refuses non-positive or non-finite arguments', () => {
    expect(() => calibrationFactor(0, 0.4, 0.01)).toThrow(RangeError);
    expect(() => calibrationFactor(100, Number.NaN, 0.01)).toThrow(RangeError);
    expect(() => absoluteLuminance(-1, 0.4, 0.01)).toThrow(RangeError);
  });

  it('recovers a generated scene’s true cd/m² within 2% at a different exposure and level', async () => {
    // an invented camera: K_TRUE cd/m² per unit of Y·N²/(t·S)
    const K_TRUE = 640;
    const calExp: ExposureSetting = { exposureTime: 1 / 100, fNumber: 8, iso: 100 };
    const cal = await renderCapture({ width: 320, height: 240, seed: 5, displayLevel: 0.4, ghost: null, exposures: { on: calExp, off: calExp, ambient: calExp } });
    const photo = await decodePhoto(cal.on);
    // what a spot meter aimed at the patch would read
    const meter = (K_TRUE * cal.truth.luminance.on) / (exposureFactor(calExp) as number);
    const c = calibrateFromPatch(photo.raster, cal.truth.screen, photo.exposure, meter);
    expect(Math.abs(c.k / K_TRUE - 1)).toBeLessThan(0.02);

    const shotExp: ExposureSetting = { exposureTime: 1 / 50, fNumber: 5.6, iso: 200 };
    const shot = await renderCapture({ width: 320, height: 240, seed: 9, displayLevel: 0.6, ghost: null, exposures: { on: shotExp, off: shotExp, ambient: shotExp } });
    const on = await decodePhoto(shot.on);
    const off = await decodePhoto(shot.off);
    const r = analyzeCapture({ on: { raster: on.raster, exposure: on.exposure }, off: { raster: off.raster, exposure: off.exposure }, screen: shot.truth.screen, ghostOffset: 'none', calibration: c.k });
    const trueOn = (K_TRUE * shot.truth.luminance.on) / (exposureFactor(shotExp) as number);
    const trueOff = (K_TRUE * shot.truth.luminance.off) / (exposureFactor(shotExp) as number);
    expect(r.absoluteLuminance?.kind).toBe('calibrated');
    expect(Math.abs((r.absoluteLuminance?.on as number) / trueOn - 1)).toBeLessThan(0.02);
    expect(Math.abs((r.absoluteLuminance?.off as number) / trueOff - 1)).toBeLessThan(0.02);
  });

  it('refuses a clipped patch, a dark patch, a patch outside the photo and a photo without exposure EXIF', () => {
    const grey = (v: number): PhotoRaster => ({ data: new Uint8Array(16 * 16 * 3).fill(v), width: 16, height: 16, channels: 3, bitDepth: 8, encoding: 'srgb' });
    const tags = { exposureTime: 0.01, fNumber: 8, iso: 100 };
    const patch = { x: 4, y: 4, w: 8, h: 8 };
    expect(() => calibrateFromPatch(grey(255), patch, tags, 100)).toThrow(/clipped/);
    expect(() => calibrateFromPatch(grey(3), patch, tags, 100)).toThrow(/too dark/);
    expect(() => calibrateFromPatch(grey(128), { x: 10, y: 10, w: 8, h: 8 }, tags, 100)).toThrow(/outside/);
    expect(() => calibrateFromPatch(grey(128), patch, null, 100)).toThrow(/EXIF/);
    expect(() => calibrateFromPatch(grey(128), patch, tags, 0)).toThrow(/meter reading/);
    expect(calibrateFromPatch(grey(128), { x: 0, y: 0, w: 1, h: 1 }, tags, 100).pixels).toBe(1);
  });
});
