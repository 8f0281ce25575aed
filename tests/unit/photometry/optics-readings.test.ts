import Color from 'colorjs.io';
import { uv as uvOf, xy as xyOf } from 'colorjs.io/fn';
import { describe, expect, it } from 'vitest';
import { analyzeCapture, type CapturePhoto } from '../../../lib/photometry';
import { renderOpticsScene, type OpticsScene, type Rgb } from '../../fixtures/optics-scene';
import { gaussianMtf50 } from '../../fixtures/slanted-edge';

const DEG = 180 / Math.PI;
const SCREEN = { x: 300, y: 200, w: 600, h: 400 };
const base: OpticsScene = { width: 1200, height: 800, screen: SCREEN, pattern: 'slanted-edge', white: [0.5, 0.5, 0.5], sigma: 1.5, room: 0.08, noise: 0.004, seed: 3 };
// a 24 mm lens on a sensor of 200 px/mm: f = 4800 px
const EXIF = { focalLength: 24, focalPlanePxPerMm: 200, exifLongSide: 1200 };

function analyse(scene: Partial<OpticsScene>, extra: Parameters<typeof analyzeCapture>[0] extends infer I ? Partial<I> : never = {}) {
  const s = renderOpticsScene({ ...base, ...scene });
  const photo = (raster: CapturePhoto['raster']): CapturePhoto => ({ raster, exposure: EXIF });
  return analyzeCapture({ on: photo(s.on), off: photo(s.off), dark: s.dark ? photo(s.dark) : null, pattern: scene.pattern ?? base.pattern, ghostOffset: 'none', ...extra });
}

describe('optics readings through the whole analysis', () => {
  for (const sigma of [1, 2.5]) {
    it(`reads MTF50 of a display blurred by σ = ${sigma} px within 3% of √(ln 2 / (2π²σ²)), with the screen detected`, () => {
      const r = analyse({ sigma, seed: Math.round(10 * sigma) });
      expect(r.screen.source).toBe('detected');
      expect(r.sharpness).not.toBeNull();
      // MTF50 of a Gaussian blur (derived)
      expect(Math.abs((r.sharpness?.mtf50 as number) / gaussianMtf50(sigma) - 1)).toBeLessThan(0.03);
      expect(Math.abs((r.sharpness?.edgeAngle as number) - 5)).toBeLessThan(0.2);
      expect(r.sharpness?.curve).toHaveLength(101);
      // cycles per degree: cycles per pixel over degrees per pixel
      expect(r.sharpness?.mtf50PerDegree).toBeCloseTo((r.sharpness?.mtf50 as number) / (r.geometry?.degreesPerPixel as number), 1);
      expect(r.warnings.map((w) => w.code)).not.toContain('sharpness-unmeasured');
    });
  }

  it('reads the sharpness from the dark photo when there is one', () => {
    const r = analyse({ sigma: 1.5, darkRoom: 0.05, seed: 8 });
    expect(Math.abs((r.sharpness?.mtf50 as number) / gaussianMtf50(1.5) - 1)).toBeLessThan(0.03);
  });

  it('gives the screen’s field of view by the pinhole relation 2·atan(s / 2f), and pixels per degree', () => {
    const r = analyse({ pattern: 'full' }, { screen: SCREEN, optics: { displayResolution: { width: 1280, height: 720 } } });
    // pinhole, derived: f = 24 mm × 200 px/mm = 4800 px
    const fovH = 2 * Math.atan(600 / (2 * 4800)) * DEG;
    expect(r.geometry?.source).toBe('exif-focal-sensor');
    expect(r.geometry?.fovH).toBeCloseTo(fovH, 3);
    expect(r.geometry?.fovV).toBeCloseTo(2 * Math.atan(400 / (2 * 4800)) * DEG, 3);
    expect(r.geometry?.fovD).toBeCloseTo(2 * Math.atan(Math.hypot(600, 400) / (2 * 4800)) * DEG, 3);
    expect(r.geometry?.pixelsPerDegree).toBeCloseTo(1280 / fovH, 1);
    expect(r.sharpness).toBeNull();
    // a camera profile's degrees per pixel wins over the EXIF
    const p = analyse({ pattern: 'full' }, { screen: SCREEN, optics: { degreesPerPixel: 0.02 } });
    expect(p.geometry?.source).toBe('camera-profile');
    expect(p.geometry?.fovH).toBeCloseTo(2 * Math.atan(300 * Math.tan(0.02 / DEG)) * DEG, 3);
  });

  it('gives the display’s chromaticity and colour uniformity as colorjs.io does for its light', () => {
    const cells: Rgb[] = Array.from({ length: 9 }, (_, i) => [0.42 + 0.01 * (i % 3), 0.4, 0.45 - 0.01 * Math.floor(i / 3)]);
    const r = analyse({ pattern: 'full', white: cells, seed: 21 }, { screen: SCREEN });
    const c = r.displayColour as NonNullable<typeof r.displayColour>;
    // the screen mean of equal-area cells, through colorjs.io's sRGB (oracle)
    const mean: Rgb = [0, 1, 2].map((k) => cells.reduce((s, x) => s + (x[k] as number), 0) / 9) as Rgb;
    const o = new Color('srgb-linear', mean);
    expect(Math.abs(c.x - xyOf(o)[0]!)).toBeLessThan(5e-4);
    expect(Math.abs(c.y - xyOf(o)[1]!)).toBeLessThan(5e-4);
    let worst = 0;
    for (const a of cells) for (const b of cells) {
      const p = uvOf(new Color('srgb-linear', a));
      const q = uvOf(new Color('srgb-linear', b));
      worst = Math.max(worst, Math.hypot(p[0]! - q[0]!, p[1]! - q[1]!));
    }
    expect(Math.abs((c.uniformityDuv as number) - worst)).toBeLessThan(5e-4);
    expect(c.whiteRef).toBe('D65');
    // the room behind (neutral, in on and off alike) drops out: the same with a brighter room
    const brighter = analyse({ pattern: 'full', white: cells, seed: 21, room: 0.2 }, { screen: SCREEN }).displayColour;
    expect(Math.abs((brighter?.x as number) - c.x)).toBeLessThan(5e-4);
  });

  it('measures the colour on the dark photo less the room light it holds', () => {
    const white: Rgb = [0.5, 0.42, 0.35];
    const r = analyse({ pattern: 'full', white, darkRoom: 0.1, seed: 5, room: 0.15 }, { screen: SCREEN, optics: { displayWhite: { x: 0.3127, y: 0.329 } } });
    const o = new Color('srgb-linear', white);
    expect(Math.abs((r.displayColour?.x as number) - xyOf(o)[0]!)).toBeLessThan(5e-4);
    expect(r.displayColour?.whiteRef).toBe('display');
    // McCamy's cubic (McCamy 1992, from memory, docs/references.md) on colorjs.io's chromaticity of the display's white
    const [x, y] = xyOf(o);
    const k = (x - 0.332) / (0.1858 - y);
    expect(Math.abs((r.displayColour?.cct as number) - (449 * k ** 3 + 3525 * k ** 2 + 6823.3 * k + 5520.33))).toBeLessThan(15);
  });

  it('warns and gives no sharpness when a slanted-edge set shows a plain white screen', () => {
    const r = analyse({ pattern: 'full' }, { pattern: 'slanted-edge', screen: SCREEN });
    expect(r.sharpness).toBeNull();
    expect(r.warnings.find((w) => w.code === 'sharpness-unmeasured')?.message).toMatch(/dark square/);
  });

  it('refuses bad optics options with a message', () => {
    expect(() => analyse({ pattern: 'full' }, { optics: { degreesPerPixel: 5 } })).toThrow(/degrees per pixel/);
    expect(() => analyse({ pattern: 'full' }, { optics: { displayWhite: { x: 0.7, y: 0.5 } } })).toThrow(/display white/);
  });
});
