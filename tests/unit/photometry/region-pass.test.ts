import { converter } from 'culori';
import { describe, expect, it } from 'vitest';
import { measureRects, totalsMean, totalsRgbMean } from '../../../lib/photometry/region-pass';
import type { Offset, PhotoRaster, Rect } from '../../../lib/photometry/types';
import { seededRandom } from '../../fixtures/seeded-random';

// Independent oracle: culori's sRGB → linear-light conversion (IEC 61966-2-1 transfer function),
// then relative luminance with the ITU-R BT.709 weights (published), pixel by pixel in float64.
const toLinear = converter('lrgb');
const W709 = { r: 0.2126, g: 0.7152, b: 0.0722 };

function randomRaster(width: number, height: number, channels: 1 | 3, bitDepth: 8 | 16, seed: number): PhotoRaster {
  // the same pixels every run
  const next = seededRandom(seed);
  const max = bitDepth === 8 ? 255 : 65535;
  const n = width * height * channels;
  const data = bitDepth === 8 ? new Uint8Array(n) : new Uint16Array(n);
  // a few codes at full scale so the clipped count has something to count
  for (let i = 0; i < n; i++) data[i] = next() < 0.03 ? max : Math.floor(next() * (max + 1));
  return { data, width, height, channels, bitDepth, encoding: 'srgb' };
}

interface Oracle {
  sum: number;
  n: number;
  clipped: number;
  r: number;
  g: number;
  b: number;
}

/** Every pixel of `rect` (reference coordinates) read from the photo `offset` away, one by one. */
function oracle(raster: PhotoRaster, rect: Rect, offset: Offset, scale: number): Oracle {
  const max = raster.bitDepth === 8 ? 255 : 65535;
  const clipCode = Math.ceil(0.98 * max);
  const out: Oracle = { sum: 0, n: 0, clipped: 0, r: 0, g: 0, b: 0 };
  for (let y = rect.y; y < rect.y + rect.h; y++) {
    for (let x = rect.x; x < rect.x + rect.w; x++) {
      const sx = x + offset.dx;
      const sy = y + offset.dy;
      if (sx < 0 || sy < 0 || sx >= raster.width || sy >= raster.height) continue;
      const p = (sy * raster.width + sx) * raster.channels;
      const codes = raster.channels === 3 ? [raster.data[p], raster.data[p + 1], raster.data[p + 2]] : [raster.data[p], raster.data[p], raster.data[p]];
      const [cr, cg, cb] = codes as [number, number, number];
      const lin = toLinear({ mode: 'rgb', r: cr / max, g: cg / max, b: cb / max });
      out.sum += (W709.r * lin.r + W709.g * lin.g + W709.b * lin.b) * scale;
      out.r += lin.r;
      out.g += lin.g;
      out.b += lin.b;
      out.n++;
      if (cr >= clipCode || cg >= clipCode || cb >= clipCode) out.clipped++;
    }
  }
  return out;
}

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

describe('measureRects — one pass over raw pixels against a pixel-by-pixel oracle (culori, BT.709)', () => {
  // overlapping rectangles, one asked twice (with and without colour), one partly off the shifted photo
  const rects: { rect: Rect; rgb?: boolean }[] = [
    { rect: { x: 3, y: 2, w: 30, h: 17 } },
    { rect: { x: 3, y: 2, w: 30, h: 17 }, rgb: true },
    { rect: { x: 10, y: 5, w: 9, h: 9 } },
    { rect: { x: 15, y: 0, w: 22, h: 6 }, rgb: true },
    { rect: { x: 0, y: 18, w: 37, h: 5 } },
    { rect: { x: 36, y: 22, w: 1, h: 1 } },
  ];
  const cases: [string, PhotoRaster, Offset, number][] = [
    ['8-bit RGB, shifted', randomRaster(37, 23, 3, 8, 11), { dx: 2, dy: -1 }, 1.7],
    ['8-bit RGB, not shifted', randomRaster(37, 23, 3, 8, 12), { dx: 0, dy: 0 }, 1],
    ['8-bit grey, shifted', randomRaster(37, 23, 1, 8, 13), { dx: -3, dy: 2 }, 0.4],
    ['16-bit RGB, shifted', randomRaster(37, 23, 3, 16, 14), { dx: 1, dy: 1 }, 2.5],
  ];
  for (const [name, raster, offset, scale] of cases) {
    it(`${name}: luminance, counts, clipping and colour sums agree to 1e-12`, () => {
      const totals = measureRects(raster, rects, offset, scale);
      rects.forEach((q, i) => {
        const t = totals[i];
        const o = oracle(raster, q.rect, offset, scale);
        expect(t?.n).toBe(o.n);
        expect(t?.clipped).toBe(o.clipped);
        if (o.n === 0) {
          expect(totalsMean(t as NonNullable<typeof t>)).toBeNaN();
          return;
        }
        expect(rel(t?.sum as number, o.sum)).toBeLessThan(1e-12);
        if (q.rgb) {
          const m = totalsRgbMean(t as NonNullable<typeof t>);
          expect(rel(m.r, o.r / o.n)).toBeLessThan(1e-12);
          expect(rel(m.g, o.g / o.n)).toBeLessThan(1e-12);
          expect(rel(m.b, o.b / o.n)).toBeLessThan(1e-12);
        } else {
          expect(t?.rgb).toBeNull();
        }
      });
    });
  }

  it('counts the clipped pixels that a one-pixel shift brings in and drops', () => {
    const raster = randomRaster(8, 4, 3, 8, 21);
    raster.data.fill(10);
    // one clipped pixel at (5, 2) of the photo: reference (4, 2) when the photo sits one pixel right
    raster.data[(2 * 8 + 5) * 3 + 1] = 255;
    const [a, b] = measureRects(raster, [{ rect: { x: 4, y: 2, w: 1, h: 1 } }, { rect: { x: 5, y: 2, w: 1, h: 1 } }], { dx: 1, dy: 0 }, 1);
    expect(a?.clipped).toBe(1);
    expect(b?.clipped).toBe(0);
  });
});
