import { describe, expect, it } from 'vitest';
import { analyzeFiles } from '../../../lib/image/analyze-files';
import { robustLine } from '../../../lib/photometry/robust-line';
import { fitBlocks, MIN_RANGE_RATIO } from '../../../lib/photometry/stages/see-through-fit';
import { blockScatter, clippedSigma, michelsonU, quantisationVariance, ratioU, registrationU } from '../../../lib/photometry/uncertainty';
import { ISO800, renderRealisticScene, type RealisticSceneOptions } from '../../fixtures/realistic-scene';
import { renderCapture } from '../../fixtures/capture-generator';
import { seededRandom } from '../../fixtures/seeded-random';

function normal(rand: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(Math.max(rand(), 1e-12))) * Math.cos(2 * Math.PI * rand());
}

describe('robustLine', () => {
  it('recovers a line through noise and 10% gross outliers, with standard errors as ordinary least squares gives', () => {
    const rand = seededRandom(4);
    const g = normal(rand);
    const n = 2000;
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x[i] = 0.05 + 0.5 * rand();
      y[i] = 0.01 + 0.7 * (x[i] as number) + 0.002 * g();
      if (i % 10 === 3) y[i] = (y[i] as number) + 0.05 + 0.1 * rand();
    }
    const f = robustLine(x, y);
    expect(f).not.toBeNull();
    const fit = f as NonNullable<typeof f>;
    // OLS on the clean points: se(b) = σ/√Σ(x − x̄)²; x uniform on 0.5 wide: SD 0.5/√12 (derived)
    const seSlope = 0.002 / Math.sqrt(0.9 * n * (0.5 * 0.5) / 12);
    expect(fit.uSlope).toBeGreaterThan(0.9 * seSlope);
    expect(fit.uSlope).toBeLessThan(1.2 * seSlope);
    expect(Math.abs(fit.slope - 0.7)).toBeLessThan(3 * fit.uSlope);
    expect(Math.abs(fit.intercept - 0.01)).toBeLessThan(3 * fit.uIntercept);
    expect(fit.scale).toBeGreaterThan(0.0018);
    expect(fit.scale).toBeLessThan(0.0022);
  });

  it('gives an exact line exactly, and nothing for points with no spread in x', () => {
    const x = Float64Array.from([1, 2, 3, 4, 5]);
    const y = x.map((v) => 3 - 2 * v);
    const f = robustLine(x, y);
    expect(f?.slope).toBeCloseTo(-2, 12);
    expect(f?.intercept).toBeCloseTo(3, 12);
    expect(robustLine(Float64Array.from([2, 2, 2, 2]), Float64Array.from([1, 2, 3, 4]))).toBeNull();
  });
});

describe('uncertainty building blocks', () => {
  it('reads the scatter of 16 px block means of white noise as σ/16', () => {
    const rand = seededRandom(9);
    const g = normal(rand);
    const W = 640;
    const H = 480;
    const data = new Float32Array(W * H);
    for (let i = 0; i < data.length; i++) data[i] = 0.3 + 0.01 * g();
    // a smooth gradient and a sharp step must not count as noise
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) data[y * W + x] = (data[y * W + x] as number) + 0.0002 * x + (x > 333 ? 0.05 : 0);
    const s = blockScatter({ data, width: W, height: H }, { x: 0, y: 0, w: W, h: H }, 1);
    expect(s.block).toBe(16);
    expect(s.sigma * 16).toBeGreaterThan(0.0093);
    expect(s.sigma * 16).toBeLessThan(0.0107);
  });

  it('clips far outliers out of the SD', () => {
    const g = normal(seededRandom(2));
    const v = Array.from({ length: 4000 }, (_, i) => (i % 12 === 0 ? 40 : g()));
    expect(clippedSigma(v)).toBeGreaterThan(0.95);
    expect(clippedSigma(v)).toBeLessThan(1.05);
  });

  it('propagates to ratios and Michelson as JCGM 100:2008 §5.1.2 gives (derived)', () => {
    // r = a/b: u²(r)/r² = u²(a)/a² + u²(b)/b²
    expect(ratioU(4, 0.04, 2, 0.01)).toBeCloseTo(2 * Math.hypot(0.01, 0.005), 12);
    // m = (a − b)/(a + b): ∂m/∂a = 2b/(a + b)², ∂m/∂b = −2a/(a + b)²
    expect(michelsonU(3, 0.1, 1, 0.2)).toBeCloseTo(Math.hypot((2 * 1 * 0.1) / 16, (2 * 3 * 0.2) / 16), 12);
    // a rectangular bound a: u = a/√3 (JCGM 100:2008 §4.3.7)
    expect(registrationU({ gx: 2, gy: 0 }, 0.5)).toBeCloseTo(1 / Math.sqrt(3), 12);
  });

  it('gives the quantisation variance of a code step: q²/12 per channel (JCGM 100:2008 §F.2.2.1)', () => {
    const w2 = 0.2126 ** 2 + 0.7152 ** 2 + 0.0722 ** 2;
    expect(quantisationVariance({ bitDepth: 16, encoding: 'linear' }, 0.5)).toBeCloseTo((w2 * (1 / 65535) ** 2) / 12, 20);
    // sRGB 8-bit near mid-grey: codes 187 and 188 decode to 0.4969 and 0.5029 (IEC 61966-2-1, derived)
    const q = quantisationVariance({ bitDepth: 8, encoding: 'srgb' }, 0.5);
    expect(Math.sqrt((12 * q) / w2)).toBeGreaterThan(0.0055);
    expect(Math.sqrt((12 * q) / w2)).toBeLessThan(0.0065);
  });

  it('places fit blocks a block apart, outside the rectangles left out', () => {
    const blocks = fitBlocks({ x: 0, y: 0, w: 400, h: 200 }, [{ x: 100, y: 50, w: 100, h: 100 }], 8);
    expect(blocks.length).toBeGreaterThan(200);
    for (const b of blocks) expect(b.x + 8 <= 100 || b.x >= 200 || b.y + 8 <= 50 || b.y >= 150).toBe(true);
    const xs = [...new Set(blocks.map((b) => b.x))].sort((a, b) => a - b);
    expect((xs[1] as number) - (xs[0] as number)).toBeGreaterThanOrEqual(16);
  });
});

const base: RealisticSceneOptions = {
  width: 640,
  height: 480,
  seed: 21,
  noise: ISO800,
  exactNoise: true,
  format: 'tiff16-linear',
  transmission: [0.7, 0.7, 0.7],
  veil: 0.006,
  background: { x: 8, y: 8, w: 624, h: 112 },
  screen: { x: 200, y: 160, w: 240, h: 168 },
  ghost: { gain: 0.04, dx: 60.3, dy: 40.6, blur: 1.5 },
};

async function analyse(options: RealisticSceneOptions, marked = true, calibration: number | null = null) {
  const c = await renderRealisticScene(options);
  const photo = (role: 'on' | 'off' | 'ambient') => ({ name: `${role}.tif`, bytes: (c.photos[role] as Buffer[])[0] as Buffer });
  const { result } = await analyzeFiles({ on: photo('on'), off: photo('off'), ambient: photo('ambient'), background: marked ? c.truth.background : null, screen: c.truth.screen, linear16: true, calibration, artifacts: false });
  return { result, truth: c.truth };
}

describe('optics-only transmission and veil', () => {
  it('recovers T and the veil of a generated scene within twice their standard uncertainty', async () => {
    const { result, truth } = await analyse(base);
    expect(result.engineVersion).toBe('1.2.0');
    const t = result.transmissionOptics as number;
    const uT = result.uncertainty?.transmissionOptics as number;
    expect(uT).toBeGreaterThan(0);
    expect(Math.abs(t - 0.7)).toBeLessThan(2 * uT);
    // off = 0.7·ambient + veil, so the ratio over the background is 0.7 + veil/ambient: the true
    // relative veil is the ratio minus 0.7 (derived from the scene's own truth)
    const veil = result.veil as NonNullable<typeof result.veil>;
    const trueVeil = truth.transmission - 0.7;
    expect(Math.abs(veil.relative - trueVeil)).toBeLessThan(2 * (result.uncertainty?.veil as number));
    expect(veil.source).toBe('background');
    expect(veil.rangeRatio).toBeGreaterThan(MIN_RANGE_RATIO);
    expect(veil.cdm2).toBeNull();
    // the ratio keeps the veil: it reads above the optics' own transmission
    expect(result.transmission as number).toBeGreaterThan(t + 0.02);
    for (const key of ['ambientContrastRatio', 'michelson', 'uniformity', 'ghostRatio', 'transmission', 'transmissionOptics', 'veil'] as const) {
      expect(result.uncertainty?.[key], key).toBeGreaterThan(0);
    }
  }, 60_000);

  it('fits each channel for a tinted optic', async () => {
    const { result } = await analyse({ ...base, transmission: [0.62, 0.7, 0.55] });
    const ch = result.veil?.channels as NonNullable<NonNullable<typeof result.veil>['channels']>;
    expect(ch.r.t).toBeGreaterThan(0.61);
    expect(ch.r.t).toBeLessThan(0.63);
    expect(ch.g.t).toBeGreaterThan(0.69);
    expect(ch.g.t).toBeLessThan(0.71);
    expect(ch.b.t).toBeGreaterThan(0.54);
    expect(ch.b.t).toBeLessThan(0.56);
    for (const c of [ch.r, ch.g, ch.b]) expect(c.veil).toBeGreaterThan(0);
  }, 60_000);

  it('gives the veil in cd/m² with a camera profile (JPEG with exposure EXIF)', async () => {
    const c = await renderRealisticScene({ ...base, format: 'jpeg' });
    const photo = (role: 'on' | 'off' | 'ambient') => ({ name: `${role}.jpg`, bytes: (c.photos[role] as Buffer[])[0] as Buffer });
    const { result } = await analyzeFiles({ on: photo('on'), off: photo('off'), ambient: photo('ambient'), background: c.truth.background, screen: c.truth.screen, calibration: 1000, artifacts: false });
    expect(result.absoluteLuminance?.kind).toBe('calibrated');
    const abs = result.absoluteLuminance as NonNullable<typeof result.absoluteLuminance>;
    // cd/m² per unit of relative luminance, and the scene's veil of 0.006 in those units
    const k = abs.on / result.luminance.on;
    const cdm2 = result.veil?.cdm2 as number;
    expect(cdm2 / (k * 0.006)).toBeGreaterThan(0.85);
    expect(cdm2 / (k * 0.006)).toBeLessThan(1.15);
  }, 60_000);

  it('fits over the frame outside the screen, its edge zone and the ghost when no background is marked', async () => {
    const { result } = await analyse(base, false);
    expect(result.veil?.source).toBe('outside-screen');
    expect(Math.abs((result.transmissionOptics as number) - 0.7)).toBeLessThan(Math.max(0.005, 3 * (result.uncertainty?.transmissionOptics as number)));
  }, 60_000);

  it('warns and gives neither figure when the room over the fit region has too little range', async () => {
    // a plain wall: only a 20% fall-off from top to bottom
    const { result } = await analyse({ ...base, room: 'plain' });
    expect(result.transmissionOptics).toBeNull();
    expect(result.veil).toBeNull();
    expect(result.uncertainty?.transmissionOptics).toBeUndefined();
    const w = result.warnings.find((x) => x.code === 'see-through-range-small');
    expect(w?.message).toMatch(/dark and bright objects/);
    // the ratio is still given
    expect(result.transmission).not.toBeNull();
  }, 60_000);
});

describe('uncertainty of the other patterns and variants', () => {
  it('gives the checkerboard contrast and a dark photo\'s uniformity a standard uncertainty', async () => {
    const board = await renderCapture({ width: 480, height: 360, seed: 5, pattern: 'checkerboard', noise: 0.004 });
    const ph = (c: typeof board, r: 'on' | 'off' | 'ambient') => ({ name: `${r}.jpg`, bytes: c[r] });
    const a = (await analyzeFiles({ on: ph(board, 'on'), off: ph(board, 'off'), ambient: ph(board, 'ambient'), pattern: 'checkerboard', screen: board.truth.screen, artifacts: false })).result;
    const uA = a.uncertainty?.ansiContrast as number;
    expect(uA).toBeGreaterThan(0);
    expect(uA).toBeLessThan(0.05 * (a.ansiContrast as number));
    expect(a.uncertainty?.michelson).toBeGreaterThan(0);
    // the checkerboard has no 3 × 3 uniformity
    expect(a.uncertainty?.uniformity).toBeUndefined();

    const dark = await renderCapture({ width: 480, height: 360, seed: 6, withDark: true, noise: 0.004 });
    const d = (await analyzeFiles({ on: ph(dark, 'on'), off: ph(dark, 'off'), ambient: ph(dark, 'ambient'), dark: { name: 'dark.jpg', bytes: dark.dark as Buffer }, screen: dark.truth.screen, artifacts: false })).result;
    expect(d.variants.dark).not.toBeNull();
    const uU = d.uncertainty?.uniformity as number;
    expect(uU).toBeGreaterThan(0);
    expect(uU).toBeLessThan(0.05);
  }, 60_000);
});
