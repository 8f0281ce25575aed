import { describe, expect, it } from 'vitest';
import { decodePhoto } from '../../../lib/image/decode';
import { analyzeCapture, exposureFactor, isEngineInputError, mergeBracket, type CapturePhoto, type PhotoRaster, type Rect } from '../../../lib/photometry';
import { measureRects } from '../../../lib/photometry/region-pass';
import { renderCapture, type ExposureSetting } from '../../fixtures/capture-generator';

// exposures one and two stops of 4 apart: E ratios 1/16, 1 and 16 against the reference
const REF: ExposureSetting = { exposureTime: 1 / 100, fNumber: 8, iso: 100 };
const SHORT: ExposureSetting = { exposureTime: 1 / 1600, fNumber: 8, iso: 100 };
const LONG: ExposureSetting = { exposureTime: 0.16, fNumber: 8, iso: 100 };

// A display 1000 times brighter than the room behind it, in linear units of the reference exposure
const DISPLAY = 2.8;
const ROOM = 0.004;

async function shoot(e: ExposureSetting) {
  const s = (exposureFactor(e) as number) / (exposureFactor(REF) as number);
  // the generator exposes every role like its on photo, so the scene itself is scaled; read noise stays
  const r = await renderCapture({ width: 320, height: 240, seed: 11, displayLevel: DISPLAY * s, backgroundLevel: ROOM * s, veil: 0, ghost: null, noise: 0.001, exposures: { on: e, off: e, ambient: e } });
  const on = await decodePhoto(r.on);
  const off = await decodePhoto(r.off);
  return { truth: r.truth, s, on: { raster: on.raster, exposure: on.exposure } as CapturePhoto, off: { raster: off.raster, exposure: off.exposure } as CapturePhoto };
}

const meanY = (r: PhotoRaster, rect: Rect): number => {
  const [t] = measureRects(r, [{ rect }], { dx: 0, dy: 0 }, 1);
  return (t?.sum as number) / (t?.n as number);
};

const rel = (a: number, b: number): number => Math.abs(a / b - 1);

describe('exposure brackets merged into one linear plane', () => {
  it('measures a 1000:1 display over a dark room within 2% where each single exposure clips or drowns in noise', async () => {
    const ref = await shoot(REF);
    const short = await shoot(SHORT);
    const long = await shoot(LONG);
    const truth = ref.truth;
    expect(truth.ambientContrastRatio).toBeGreaterThan(900);
    const common = { screen: truth.screen, ghostOffset: 'none' as const };

    for (const single of [short, ref, long]) {
      let r;
      try {
        r = analyzeCapture({ on: single.on, off: single.off, ...common });
      } catch (e) {
        // the shortest exposure leaves the room in read noise: nothing to register the off photo by
        expect(isEngineInputError(e) && e.code === 'camera-moved').toBe(true);
        expect(single).toBe(short);
        continue;
      }
      // a single exposure either clips the display or loses the room in read noise
      expect(rel(r.ambientContrastRatio as number, truth.ambientContrastRatio)).toBeGreaterThan(0.02);
      const worst = Math.max(rel(r.luminance.on / single.s, truth.luminance.on), rel(r.luminance.off / single.s, truth.luminance.off));
      expect(worst).toBeGreaterThan(0.02);
    }
    // measured alone over the same regions, without registration, the short exposure is off too
    const shortOff = meanY(short.off.raster, truth.screen) / short.s;
    expect(rel(shortOff, truth.luminance.off)).toBeGreaterThan(0.02);

    const merged = analyzeCapture({ on: [ref.on, short.on, long.on], off: [ref.off, short.off, long.off], ...common });
    expect(rel(merged.luminance.on, truth.luminance.on)).toBeLessThan(0.02);
    expect(rel(merged.luminance.off, truth.luminance.off)).toBeLessThan(0.02);
    expect(rel(merged.ambientContrastRatio as number, truth.ambientContrastRatio)).toBeLessThan(0.02);
    expect(merged.clippedFraction).toBeLessThan(0.001);
    expect(merged.warnings.map((w) => w.code)).not.toContain('clipped');
    expect(merged.brackets?.on?.count).toBe(3);
    // the on bracket spans the display and the dark room around it
    expect(merged.brackets?.on?.dynamicRange as number).toBeGreaterThan(100);
    expect(merged.brackets?.on?.stops as number).toBeCloseTo(Math.log2(merged.brackets?.on?.dynamicRange as number), 9);
  });

  it('treats a bracket of one photo exactly as that photo', async () => {
    const ref = await shoot(REF);
    const a = analyzeCapture({ on: ref.on, off: ref.off, ghostOffset: 'none' });
    const b = analyzeCapture({ on: [ref.on], off: [ref.off], ghostOffset: 'none' });
    expect(b).toEqual(a);
    expect('brackets' in b).toBe(false);
  });

  it('keeps pixels clipped in every member clipped, so the reading still warns', () => {
    const raster = (v: number): PhotoRaster => ({ data: new Uint8Array([v, v, v, 10, 10, 10]), width: 2, height: 1, channels: 3, bitDepth: 8, encoding: 'srgb' });
    const m = mergeBracket([
      { raster: raster(255), exposure: REF },
      { raster: raster(255), exposure: SHORT },
    ]);
    expect(m.raster.data[0]).toBe(65535);
    expect(m.summary.clippedEverywhere).toBeCloseTo(0.5, 12);
    expect(m.summary.noiseEverywhere).toBeCloseTo(0.5, 12);
  });

  it('scales each sample by E_ref/E_i (ISO 12232: signal ∝ L·t·S/N²; derived)', () => {
    // the same light at 1/16 of the exposure reads 1/16 as bright; merged back it matches the reference
    const lin = (code: number): PhotoRaster => ({ data: new Uint16Array([code]), width: 1, height: 1, channels: 1, bitDepth: 16, encoding: 'linear' });
    const m = mergeBracket([
      { raster: lin(32000), exposure: REF },
      { raster: lin(2000), exposure: SHORT },
    ]);
    expect(((m.raster.data[0] as number) / 65535) * m.gain).toBeCloseTo(32000 / 65535, 4);
  });

  it('refuses an empty bracket, photos of different sizes and photos without exposure EXIF', () => {
    const r1: PhotoRaster = { data: new Uint8Array(3), width: 1, height: 1, channels: 3, bitDepth: 8, encoding: 'srgb' };
    const r2: PhotoRaster = { data: new Uint8Array(6), width: 2, height: 1, channels: 3, bitDepth: 8, encoding: 'srgb' };
    expect(() => mergeBracket([])).toThrow(RangeError);
    expect(() => mergeBracket([{ raster: r1, exposure: REF }, { raster: r2, exposure: REF }])).toThrow(/differ in size/);
    expect(() => mergeBracket([{ raster: r1, exposure: REF }, { raster: r1, exposure: null }])).toThrow(/exposure/);
    expect(() => mergeBracket([{ raster: r1, exposure: REF }], { noiseFloor: Number.NaN })).toThrow(RangeError);
  });
});
