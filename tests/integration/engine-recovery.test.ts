import { describe, expect, it } from 'vitest';
import { analyzeFiles } from '../../lib/image';
import { EngineInputError, rectIoU, type CaptureResult } from '../../lib/photometry';
import { renderCapture, type RenderedCapture, type SceneOptions } from '../fixtures/capture-generator';

const rel = (a: number | null | undefined, b: number): number => Math.abs((a as number) - b) / Math.abs(b);

async function run(c: RenderedCapture, extra: Partial<Parameters<typeof analyzeFiles>[0]> = {}): Promise<CaptureResult> {
  const src = (name: string, bytes: Buffer | undefined) => (bytes ? { name, bytes } : null);
  const { result } = await analyzeFiles({
    on: { name: 'on.jpg', bytes: c.on },
    off: { name: 'off.jpg', bytes: c.off },
    ambient: src('ambient.jpg', c.ambient),
    dark: src('dark.jpg', c.dark),
    background: c.truth.background,
    pattern: c.truth.pattern,
    artifacts: false,
    ...extra,
  });
  return result;
}

const codes = (r: CaptureResult): string[] => r.warnings.map((w) => w.code);

describe('the engine recovers the truth of generated full-field captures', () => {
  const scene: SceneOptions = { seed: 11, shifts: { off: { dx: 4, dy: -3 }, ambient: { dx: -2, dy: 5 } }, ghost: { gain: 0.04, dx: 13, dy: 8 } };
  let c: RenderedCapture;
  let r: CaptureResult;

  it('renders and analyses', async () => {
    c = await renderCapture(scene);
    r = await run(c);
    expect(r.engineVersion).toBe('1.2.0');
  });

  it('registers the shifted photos within 1 px and warns `shifted`', () => {
    for (const role of ['off', 'ambient'] as const) {
      const got = r.registration[role];
      const want = c.truth.registration[role];
      expect(Math.abs((got?.dx as number) - want.dx)).toBeLessThanOrEqual(1);
      expect(Math.abs((got?.dy as number) - want.dy)).toBeLessThanOrEqual(1);
    }
    expect(codes(r)).toContain('shifted');
  });

  it('detects the screen with IoU ≥ 0.9', () => {
    expect(r.screen.source).toBe('detected');
    expect(rectIoU(r.screen, c.truth.screen)).toBeGreaterThanOrEqual(0.9);
  });

  it('recovers the ambient contrast ratio, transmission and uniformity within 1.5%, Michelson within 0.01', () => {
    expect(rel(r.ambientContrastRatio, c.truth.ambientContrastRatio)).toBeLessThan(0.015);
    expect(rel(r.transmission, c.truth.transmission)).toBeLessThan(0.015);
    expect(rel(r.uniformity, c.truth.uniformity as number)).toBeLessThan(0.015);
    expect(Math.abs((r.michelson as number) - c.truth.michelson)).toBeLessThan(0.01);
  });

  it('finds the ghost: ratio within 6%, offset within 1.5 px', () => {
    const g = c.truth.ghost as { ratio: number; dx: number; dy: number };
    expect(r.ghost?.source).toBe('detected');
    expect(rel(r.ghost?.ratio, g.ratio)).toBeLessThan(0.06);
    expect(Math.hypot((r.ghost?.dx as number) - g.dx, (r.ghost?.dy as number) - g.dy)).toBeLessThanOrEqual(1.5);
  });

  it('measures a neutral optic as nearly tint-free, close to the true colour shift', () => {
    expect(Math.abs((r.tint?.dx as number) - c.truth.tint.dx)).toBeLessThan(0.002);
    expect(Math.abs((r.tint?.deltaE00 as number) - c.truth.tint.deltaE00)).toBeLessThan(0.5);
    expect(r.clippedFraction).toBe(0);
    expect(codes(r)).not.toContain('clipped');
  });

  it('gives identical output for the same input (deterministic)', async () => {
    expect(JSON.stringify(await run(c))).toBe(JSON.stringify(r));
  });

  it('reports no ghost when told there is none, and uses a marked offset as given', async () => {
    expect((await run(c, { ghostOffset: 'none' })).ghost).toBeNull();
    const marked = await run(c, { ghostOffset: { dx: 13, dy: 8 }, screen: c.truth.screen });
    expect(marked.ghost?.source).toBe('marked');
    expect(marked.screen.source).toBe('marked');
    expect(rel(marked.ghost?.ratio, 0.04)).toBeLessThan(0.06);
  });
});

describe('checkerboard, exposure, clipping and refusals on generated photos', () => {
  it('recovers the 4 × 4 checkerboard contrast within 1.5% and Michelson within 0.01', async () => {
    const c = await renderCapture({ seed: 5, pattern: 'checkerboard', blackLevel: 0.02, ghost: null, displayLevel: 0.6 });
    const r = await run(c);
    expect(rel(r.ansiContrast, c.truth.ansiContrast as number)).toBeLessThan(0.015);
    expect(Math.abs((r.michelson as number) - c.truth.michelson)).toBeLessThan(0.01);
    expect(rectIoU(r.screen, c.truth.screen)).toBeGreaterThanOrEqual(0.9);
    expect(r.uniformity).toBeNull();
  });

  it('undoes an 8.163× exposure difference from EXIF (f/5.6 1/50 s ISO 200 against f/8 1/100 s ISO 100)', async () => {
    const bright = { exposureTime: 1 / 50, fNumber: 5.6, iso: 200 };
    const dim = { exposureTime: 1 / 100, fNumber: 8, iso: 100 };
    const c = await renderCapture({ seed: 8, exposures: { on: bright, off: dim, ambient: bright }, displayLevel: 0.4 });
    const r = await run(c);
    expect(r.exposure.known).toBe(true);
    expect(r.exposure.scales.off).toBeCloseTo(8.163, 3);
    expect(rel(r.ambientContrastRatio, c.truth.ambientContrastRatio)).toBeLessThan(0.015);
    expect(rel(r.transmission, c.truth.transmission)).toBeLessThan(0.015);
    // without normalisation the ratio would be off by the factor itself
    expect(rel(r.luminance.off, c.truth.luminance.off)).toBeLessThan(0.015);
  });

  it('warns `exposure-unknown` when a photo has no exposure EXIF and assumes equal exposure', async () => {
    const c = await renderCapture({ seed: 9, exposures: { off: null }, ghost: null });
    const r = await run(c);
    expect(codes(r)).toContain('exposure-unknown');
    expect(r.exposure.known).toBe(false);
    expect(rel(r.ambientContrastRatio, c.truth.ambientContrastRatio)).toBeLessThan(0.015);
  });

  it('warns `clipped` when the display saturates the on photo', async () => {
    const c = await renderCapture({ seed: 10, displayLevel: 1.4, ghost: null });
    expect(c.truth.clippedShareOn).toBeGreaterThan(0.01);
    const r = await run(c);
    expect(codes(r)).toContain('clipped');
    expect(r.clippedFraction).toBeGreaterThan(0.001);
  });

  it('uses the dark photo for ghost and uniformity and keeps both variants', async () => {
    const c = await renderCapture({ seed: 12, withDark: true, ghost: { gain: 0.05, dx: -12, dy: 10 } });
    const r = await run(c);
    expect(r.variants.dark).not.toBeNull();
    expect(rel(r.variants.dark?.ghost?.ratio, 0.05)).toBeLessThan(0.06);
    expect(rel(r.variants.onMinusOff.ghost?.ratio, 0.05)).toBeLessThan(0.06);
    expect(rel(r.uniformity, c.truth.uniformityDark as number)).toBeLessThan(0.015);
  });

  it('reads 16-bit TIFF photos as well as JPEG', async () => {
    const c = await renderCapture({ seed: 13, format: 'tiff16', width: 400, height: 300, ghost: null, exposures: { on: null, off: null, ambient: null } });
    const r = await run(c);
    expect(rel(r.ambientContrastRatio, c.truth.ambientContrastRatio)).toBeLessThan(0.015);
    expect(rel(r.transmission, c.truth.transmission)).toBeLessThan(0.015);
  });

  it('refuses a camera that moved more than 5% of the width', async () => {
    const c = await renderCapture({ seed: 14, width: 600, height: 450, shifts: { off: { dx: 40, dy: 0 } }, ghost: null });
    const e = await run(c).then(() => null, (err: unknown) => err);
    expect(e).toBeInstanceOf(EngineInputError);
    expect((e as EngineInputError).code).toBe('camera-moved');
  });
});

// At a camera's size the coarse steps (registration's first pass, detection, the ghost search)
// run on planes downsampled several times; the truth must still come back within the same bounds.
describe('the engine recovers the truth at camera size (4800 × 3200, downsampled planes)', () => {
  const scene: SceneOptions = { width: 4800, height: 3200, seed: 29, shifts: { off: { dx: 17, dy: -11 }, ambient: { dx: -9, dy: 14 } }, ghost: { gain: 0.04, dx: 61, dy: 37 } };
  let c: RenderedCapture;
  let r: CaptureResult;

  it('renders and analyses', async () => {
    c = await renderCapture(scene);
    r = await run(c);
    expect(r.image).toEqual({ width: 4800, height: 3200 });
  }, 120_000);

  it('registers within 1 px, detects the screen with IoU ≥ 0.9', () => {
    for (const role of ['off', 'ambient'] as const) {
      expect(Math.abs((r.registration[role]?.dx as number) - c.truth.registration[role].dx)).toBeLessThanOrEqual(1);
      expect(Math.abs((r.registration[role]?.dy as number) - c.truth.registration[role].dy)).toBeLessThanOrEqual(1);
    }
    expect(r.screen.source).toBe('detected');
    expect(rectIoU(r.screen, c.truth.screen)).toBeGreaterThanOrEqual(0.9);
  });

  it('recovers contrast, transmission and uniformity within 1.5%, Michelson within 0.01', () => {
    expect(rel(r.ambientContrastRatio, c.truth.ambientContrastRatio)).toBeLessThan(0.015);
    expect(rel(r.transmission, c.truth.transmission)).toBeLessThan(0.015);
    expect(rel(r.uniformity, c.truth.uniformity as number)).toBeLessThan(0.015);
    expect(Math.abs((r.michelson as number) - c.truth.michelson)).toBeLessThan(0.01);
  });

  it('finds the ghost: ratio within 6%, offset within 1.5 px', () => {
    const g = c.truth.ghost as { ratio: number; dx: number; dy: number };
    expect(r.ghost?.source).toBe('detected');
    expect(rel(r.ghost?.ratio, g.ratio)).toBeLessThan(0.06);
    expect(Math.hypot((r.ghost?.dx as number) - g.dx, (r.ghost?.dy as number) - g.dy)).toBeLessThanOrEqual(1.5);
  });
});
