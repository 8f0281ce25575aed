import { describe, expect, it } from 'vitest';
import { analyzeCapture, analyzeCaptureDetailed, meanOutside, type CaptureInput } from '../../../lib/photometry/analyze-capture';
import { EngineInputError } from '../../../lib/photometry/errors';
import { offsetAt } from '../../../lib/photometry/motion';
import { checkBothClipped, checkTransmission, checkUniformityCells } from '../../../lib/photometry/plausibility';
import { alignAndLocate } from '../../../lib/photometry/stages/align';
import { findGhost } from '../../../lib/photometry/stages/ghost';
import { contrastFigures, measureRegions, regionsOf } from '../../../lib/photometry/stages/measure';
import { normalise } from '../../../lib/photometry/stages/normalise';
import type { EngineWarning } from '../../../lib/photometry/result';
import type { PhotoRaster, Rect } from '../../../lib/photometry/types';
import { warpPlane } from '../../../lib/photometry/warp';
import { seededRandom } from '../../fixtures/capture-generator';

// Abramowitz & Stegun 7.1.26 (published, |error| ≤ 1.5e-7)
function erf(x: number): number {
  const s = Math.sign(x);
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-a * a);
  return s * y;
}

/** Share of a pixel-centred unit step at `edge` (a boundary) seen at x under a Gaussian blur σ. */
const step = (x: number, edge: number, sigma: number): number => 0.5 * (1 + erf((x - edge) / (sigma * Math.SQRT2)));

/** A rectangle of level 1 blurred by σ (analytic: a product of two blurred steps), at (x, y). */
function blurredRect(r: Rect, sigma: number, x: number, y: number): number {
  const fx = step(x + 0.5, r.x, sigma) - step(x + 0.5, r.x + r.w, sigma);
  const fy = step(y + 0.5, r.y, sigma) - step(y + 0.5, r.y + r.h, sigma);
  return fx * fy;
}

interface Scene {
  width: number;
  height: number;
  screen: Rect;
  display: number;
  /** Blur of the display's light (a defocused virtual image), px. */
  defocus: number;
  ghost: { gain: number; dx: number; dy: number } | null;
  /** Camera position of each photo (feature in photo minus feature in on), sub-pixel, and turn in degrees. */
  off?: { dx: number; dy: number; deg?: number };
  ambient?: { dx: number; dy: number };
  displayOn?: boolean;
  transmission?: number;
}

/**
 * A linear 16-bit capture rendered analytically, so sub-pixel camera moves are exact: a room of
 * soft-edged rectangles seen through optics of transmission T, a display blurred by `defocus`, and
 * its ghost displaced one way.
 */
function render(s: Scene): { on: PhotoRaster; off: PhotoRaster; ambient: PhotoRaster } {
  const rand = seededRandom(11);
  const rects: { r: Rect; v: number }[] = [];
  for (let k = 0; k < 260; k++) {
    const w = 6 + Math.floor(rand() * 40);
    const h = 6 + Math.floor(rand() * 40);
    rects.push({ r: { x: Math.floor(rand() * (s.width + 40)) - 20, y: Math.floor(rand() * (s.height + 40)) - 20, w, h }, v: 0.05 + 0.25 * rand() });
  }
  const room = (x: number, y: number): number => {
    let v = 0.08;
    for (const { r, v: l } of rects) {
      if (x < r.x - 3 || x > r.x + r.w + 3 || y < r.y - 3 || y > r.y + r.h + 3) continue;
      v += l * blurredRect(r, 0.7, x, y);
    }
    return v;
  };
  const display = (x: number, y: number): number => {
    let v = s.display * blurredRect(s.screen, s.defocus, x, y);
    if (s.ghost) v += s.ghost.gain * s.display * blurredRect(s.screen, s.defocus, x - s.ghost.dx, y - s.ghost.dy);
    return v;
  };
  const T = s.transmission ?? 0.6;
  const photo = (kind: 'on' | 'off' | 'ambient', pose: { dx: number; dy: number; deg?: number }): PhotoRaster => {
    const data = new Uint16Array(s.width * s.height);
    const m = { dx: pose.dx, dy: pose.dy, angle: ((pose.deg ?? 0) * Math.PI) / 180, cx: (s.width - 1) / 2, cy: (s.height - 1) / 2 };
    // the world point seen at pixel p of this photo is the one at p − motion in the on photo (inverse of a small motion)
    for (let y = 0; y < s.height; y++) {
      for (let x = 0; x < s.width; x++) {
        const o = offsetAt(m, x, y);
        const wx = x - o.dx;
        const wy = y - o.dy;
        let v = kind === 'ambient' ? room(wx, wy) : T * room(wx, wy) + 0.01;
        if (kind === 'on' && s.displayOn !== false) v += display(wx, wy);
        data[y * s.width + x] = Math.round(Math.min(1, v) * 65535);
      }
    }
    return { data, width: s.width, height: s.height, channels: 1, bitDepth: 16, encoding: 'linear' };
  };
  return { on: photo('on', { dx: 0, dy: 0 }), off: photo('off', s.off ?? { dx: 0, dy: 0 }), ambient: photo('ambient', s.ambient ?? { dx: 0, dy: 0 }) };
}

const BASE: Scene = { width: 480, height: 360, screen: { x: 150, y: 110, w: 180, h: 130 }, display: 0.5, defocus: 0.6, ghost: null };
const inputOf = (p: ReturnType<typeof render>, extra: Partial<CaptureInput> = {}): CaptureInput => ({ on: { raster: p.on }, off: { raster: p.off }, ambient: { raster: p.ambient }, background: { x: 10, y: 10, w: 80, h: 60 }, ...extra });

describe('stages of the analysis (docs/method.md §5)', () => {
  const ghostScene = render({ ...BASE, ghost: { gain: 0.05, dx: 34, dy: 21 }, off: { dx: 0.6, dy: -1.3 }, ambient: { dx: -1.4, dy: 0.7 } });

  it('staged by hand gives what the one-pass analysis gives', () => {
    const input = inputOf(ghostScene);
    const whole = analyzeCapture(input);
    const n = normalise(input, null);
    const a = alignAndLocate(n, { screen: null, ghostOffset: null }, null);
    const totals = measureRegions(n, a.motion, regionsOf(a.screen, input.background ?? null, 'full'), { ambientFollows: false }, null);
    const levels = contrastFigures(n, totals, 'full', []);
    const background = meanOutside(a.diffSmall, a.mask, n.factor);
    const g = findGhost({ plane: a.diffSmall, read: a.readDiff, key: null, screen: a.screen, factor: n.factor, width: n.width, height: n.height, zone: a.spread.zone, marked: null, background }, null);
    expect({ ...a.screen, source: a.screenSource }).toEqual(whole.screen);
    expect(levels.acr).toBe(whole.ambientContrastRatio);
    expect(g?.ratio).toBe(whole.ghost?.ratio);
    expect([g?.dx, g?.dy]).toEqual([whole.ghost?.dx, whole.ghost?.dy]);
  });

  it('a run on on and off first, then on the full set with the same memo, equals one run without it', () => {
    const memo = new Map<string, unknown>();
    analyzeCaptureDetailed({ on: { raster: ghostScene.on }, off: { raster: ghostScene.off }, background: { x: 10, y: 10, w: 80, h: 60 }, memo, ambientFollows: true });
    const twice = analyzeCapture({ ...inputOf(ghostScene), memo });
    const once = analyzeCapture(inputOf(ghostScene));
    expect(twice).toEqual(once);
  });

  it('registration: sub-pixel creep of the off and ambient photos to 0.1 px', () => {
    const r = analyzeCapture(inputOf(ghostScene));
    expect(Math.abs(r.registration.off.dx - 0.6)).toBeLessThanOrEqual(0.1);
    expect(Math.abs(r.registration.off.dy + 1.3)).toBeLessThanOrEqual(0.1);
    expect(Math.abs((r.registration.ambient?.dx as number) + 1.4)).toBeLessThanOrEqual(0.1);
    expect(Math.abs((r.registration.ambient?.dy as number) - 0.7)).toBeLessThanOrEqual(0.1);
  });

  it('registration: a 0.3° turn of the off photo is measured and reported', () => {
    const p = render({ ...BASE, off: { dx: 1, dy: 0.5, deg: 0.3 } });
    const r = analyzeCapture(inputOf(p));
    expect(Math.abs((r.alignment?.off?.rotationDeg as number) - 0.3)).toBeLessThan(0.05);
    expect(r.warnings.map((w) => w.code)).toContain('rotated');
  });

  it('ghost: a defocused display with no ghost reports none (its spill lies on every side alike)', () => {
    const p = render({ ...BASE, defocus: 4 });
    const r = analyzeCapture(inputOf(p));
    expect(r.ghost).toBeNull();
    expect(r.edge?.zone).toBeGreaterThan(8);
  });

  it('ghost: a defocused display with a 5% ghost reads 5% within 8%, offset within 1.5 px, spill kept out', () => {
    const p = render({ ...BASE, defocus: 3, ghost: { gain: 0.05, dx: 40, dy: 26 }, off: { dx: 0.4, dy: 1.3 } });
    const r = analyzeCapture(inputOf(p));
    expect(r.ghost).not.toBeNull();
    expect(Math.abs((r.ghost?.ratio as number) / 0.05 - 1)).toBeLessThan(0.08);
    expect(Math.abs((r.ghost?.dx as number) - 40)).toBeLessThanOrEqual(1.5);
    expect(Math.abs((r.ghost?.dy as number) - 26)).toBeLessThanOrEqual(1.5);
    expect(r.ghost?.snr).toBeGreaterThan(8);
    // marked at the right offset, the edge's spill does not inflate it either
    const marked = analyzeCapture(inputOf(p, { ghostOffset: { dx: 40, dy: 26 } }));
    expect(Math.abs((marked.ghost?.ratio as number) / 0.05 - 1)).toBeLessThan(0.08);
  });

  it('plausibility: a display that is off in the on photo is refused, or flagged when the screen is marked', () => {
    const p = render({ ...BASE, displayOn: false });
    expect(() => analyzeCapture(inputOf(p))).toThrow(EngineInputError);
    const marked = analyzeCapture(inputOf(p, { screen: BASE.screen }));
    const off = marked.warnings.find((w) => w.code === 'display-off');
    expect(off?.message).toMatch(/display looks off/);
    expect(marked.ghost).toBeNull();
  });

  it('plausibility: transmission above 1 and cells without display light are flagged', () => {
    const w: EngineWarning[] = [];
    checkTransmission(1.097, false, w);
    checkTransmission(0.7, false, w);
    expect(w.map((x) => x.code)).toEqual(['transmission-above-one']);
    expect(w[0]?.message).toMatch(/veil/);
    expect(checkUniformityCells([0.3, 0.2, -0.01], 'on − off', w)).toBe(false);
    expect(w.map((x) => x.code)).toContain('uniformity-invalid');
  });

  it('registration: a bright screen over a dim textured room does not pull the match onto its own edges', () => {
    const p = render({ ...BASE, display: 0.9, off: { dx: 2.3, dy: -1.8 }, ambient: { dx: -2.6, dy: 1.4 } });
    const r = analyzeCapture(inputOf(p));
    expect(Math.abs(r.registration.off.dx - 2.3)).toBeLessThanOrEqual(0.1);
    expect(Math.abs(r.registration.off.dy + 1.8)).toBeLessThanOrEqual(0.1);
    expect(Math.abs((r.registration.ambient?.dx as number) + 2.6)).toBeLessThanOrEqual(0.1);
  });

  it('plausibility: clipped on and off photos are flagged; a file with several pages says which was measured', () => {
    const w: EngineWarning[] = [];
    checkBothClipped({ on: 0.2, off: 0.01 }, w);
    checkBothClipped({ on: 0.2, off: 0 }, w);
    expect(w.map((x) => x.code)).toEqual(['both-clipped']);
    const n = normalise({ on: { raster: ghostScene.on, pages: { count: 3, measured: 0 } }, off: { raster: ghostScene.off } }, null);
    const pages = n.warnings.find((x) => x.code === 'multi-page');
    expect(pages?.message).toMatch(/3 pages; page 1 was measured/);
  });

  it('warp: a plane moved by a fraction of a pixel is read back by bilinear interpolation', () => {
    const plane = { data: Float32Array.from({ length: 64 }, (_, i) => (i % 8) * 2 + Math.floor(i / 8) * 3), width: 8, height: 8 };
    const out = warpPlane(plane, { dx: 0.25, dy: 0.5, angle: 0, cx: 3.5, cy: 3.5 });
    // a linear ramp is reproduced exactly: value at (x + 0.25, y + 0.5)
    expect(out.data[2 * 8 + 3]).toBeCloseTo((3 + 0.25) * 2 + (2 + 0.5) * 3, 5);
    expect(Number.isNaN(out.data[7 * 8 + 7] as number)).toBe(true);
  });
});
