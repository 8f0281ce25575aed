import Color from 'colorjs.io';
import { uv as uvOf, xy as xyOf } from 'colorjs.io/fn';
import { describe, expect, it } from 'vitest';
import { cctMcCamy, deltaUv, displayColourOf, planckianDuv, sampledRgbMeans, uvPrime } from '../../../lib/photometry/display-colour';
import type { PhotoRaster } from '../../../lib/photometry/types';
import { seededRandom } from '../../fixtures/seeded-random';

// colorjs.io as the oracle for chromaticity and u′v′ (CIE 15:2004 formulas, its own sRGB matrix)
const oracle = (rgb: [number, number, number]) => {
  const c = new Color('srgb-linear', rgb);
  return { xy: xyOf(c), uv: uvOf(c) };
};

describe('display colour (docs/method.md §5.12)', () => {
  it('gives x, y and u′v′ of linear RGB as colorjs.io does', () => {
    const rand = seededRandom(4);
    for (let i = 0; i < 50; i++) {
      const rgb: [number, number, number] = [0.05 + rand(), 0.05 + rand(), 0.05 + rand()];
      const got = displayColourOf([{ r: rgb[0], g: rgb[1], b: rgb[2], n: 1 }], { grid: false }) as NonNullable<ReturnType<typeof displayColourOf>>;
      const o = oracle(rgb);
      // the engine's sRGB matrix has the standard's 4 decimals, colorjs.io's more: about 1e-4 apart
      expect(Math.abs(got.x - o.xy[0])).toBeLessThan(2e-4);
      expect(Math.abs(got.y - o.xy[1])).toBeLessThan(2e-4);
      expect(Math.abs(got.u - o.uv[0])).toBeLessThan(2e-4);
      expect(Math.abs(got.v - o.uv[1])).toBeLessThan(2e-4);
      // the u′v′ formula itself, to the last digits, from the same x, y
      const xyz = new Color('srgb-linear', rgb).to('xyz-d65').coords as [number, number, number];
      const s = xyz[0] + xyz[1] + xyz[2];
      const uv = uvPrime({ x: xyz[0] / s, y: xyz[1] / s });
      expect(uv.u).toBeCloseTo(o.uv[0], 12);
      expect(uv.v).toBeCloseTo(o.uv[1], 12);
    }
  });

  it('gives D65 white Δu′v′ = 0 against D65 and the distance to a display white when one is given', () => {
    const white = displayColourOf([{ r: 1, g: 1, b: 1, n: 10 }], { grid: false });
    expect(white?.whiteRef).toBe('D65');
    expect(white?.duvFromWhite).toBeLessThan(2e-4);
    const own = displayColourOf([{ r: 1, g: 1, b: 1, n: 10 }], { grid: false, white: { x: 0.2831, y: 0.2971 } });
    expect(own?.whiteRef).toBe('display');
    // 9300 K-ish white: D65's u′v′ against that white's, by colorjs.io
    const d65 = uvOf(new Color('xyz-d65', [0.3127 / 0.329, 1, (1 - 0.3127 - 0.329) / 0.329]));
    const w = uvOf(new Color('xyz-d65', [0.2831 / 0.2971, 1, (1 - 0.2831 - 0.2971) / 0.2971]));
    expect(own?.duvFromWhite).toBeCloseTo(Math.hypot(d65[0] - w[0], d65[1] - w[1]), 3);
  });

  it('takes colour uniformity as the largest Δu′v′ between two of the nine cells (colorjs.io oracle)', () => {
    const rand = seededRandom(9);
    const cells = Array.from({ length: 9 }, () => ({ r: 0.8 + 0.1 * rand(), g: 0.8 + 0.1 * rand(), b: 0.8 + 0.1 * rand(), n: 100 }));
    const got = displayColourOf(cells, { grid: true });
    let worst = 0;
    for (const a of cells) for (const b of cells) {
      const p = oracle([a.r, a.g, a.b]).uv;
      const q = oracle([b.r, b.g, b.b]).uv;
      worst = Math.max(worst, Math.hypot(p[0] - q[0], p[1] - q[1]));
    }
    expect(Math.abs((got?.uniformityDuv as number) - worst)).toBeLessThan(2e-5);
    expect(displayColourOf(cells, { grid: false })?.uniformityDuv).toBeNull();
    // a cell without display light leaves no uniformity
    expect(displayColourOf([...cells.slice(0, 8), { r: 0, g: 0, b: 0, n: 100 }], { grid: true })?.uniformityDuv).toBeNull();
  });

  it('gives the CCT of CIE illuminants A, D50, D65 and D75 within 5 K (McCamy)', () => {
    // chromaticities and CCTs of CIE 15:2004's illuminants (from memory, docs/references.md; McCamy's cubic meeting all four is itself a check of both)
    expect(Math.abs((cctMcCamy({ x: 0.44757, y: 0.40745 }) as number) - 2856)).toBeLessThan(5);
    expect(Math.abs((cctMcCamy({ x: 0.34567, y: 0.3585 }) as number) - 5003)).toBeLessThan(5);
    expect(Math.abs((cctMcCamy({ x: 0.31271, y: 0.32902 }) as number) - 6504)).toBeLessThan(5);
    expect(Math.abs((cctMcCamy({ x: 0.29902, y: 0.31485 }) as number) - 7504)).toBeLessThan(5);
  });

  it('finds illuminant A on the Planckian locus and D65 a little above it', () => {
    // A is a Planckian radiator at 2856 K (published); D65 lies about 0.003 above the locus (from memory)
    expect(Math.abs(planckianDuv({ x: 0.44757, y: 0.40745 }))).toBeLessThan(2e-4);
    expect(planckianDuv({ x: 0.31271, y: 0.32902 })).toBeGreaterThan(0.0025);
    expect(planckianDuv({ x: 0.31271, y: 0.32902 })).toBeLessThan(0.004);
  });

  it('gives no CCT for a green or a deep blue light', () => {
    expect(cctMcCamy({ x: 0.3, y: 0.6 })).toBeNull();
    expect(cctMcCamy({ x: 0.16, y: 0.07 })).toBeNull();
    expect(cctMcCamy({ x: 0.25, y: 0.25 })).toBeNull();
  });

  it('samples rows of a rectangle without falling in step with a display’s periodic rows', () => {
    // every 4th row red, the others green: an even stride would see only one of them
    const W = 64;
    const H = 4000;
    const data = new Uint16Array(W * H * 3);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) data[(y * W + x) * 3 + (y % 4 === 0 ? 0 : 1)] = 65535;
    const raster: PhotoRaster = { data, width: W, height: H, channels: 3, bitDepth: 16, encoding: 'linear' };
    const [m] = sampledRgbMeans(raster, [{ x: 0, y: 0, w: W, h: H }], [{ dx: 0, dy: 0 }], 64 * 400);
    expect(m?.n).toBe(64 * 400);
    expect(Math.abs((m?.r as number) - 0.25)).toBeLessThan(0.02);
    expect(Math.abs((m?.g as number) - 0.75)).toBeLessThan(0.02);
    expect(deltaUv({ x: 0.3127, y: 0.329 }, { x: 0.3127, y: 0.329 })).toBe(0);
  });
});
