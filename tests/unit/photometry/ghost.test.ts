import { describe, expect, it } from 'vitest';
import { measureGhost, searchGhost, solveGhostRatio, forEachBandPixel, bandArea } from '../../../lib/photometry';
import { bandRects } from '../../../lib/photometry/band';
import { measureGhostStrips, type BandStrip } from '../../../lib/photometry/ghost-measure';
import { intersectRects, translateRect } from '../../../lib/photometry/rect';

function scene(w: number, h: number, screen: { x: number; y: number; w: number; h: number }, g: number, o: { dx: number; dy: number }, textured: boolean) {
  const d0 = new Float64Array(w * h);
  for (let y = screen.y; y < screen.y + screen.h; y++) {
    for (let x = screen.x; x < screen.x + screen.w; x++) d0[y * w + x] = textured ? 0.3 + 0.2 * Math.sin(x / 7) * Math.cos(y / 5) : 0.5;
  }
  const d = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const xs = x - o.dx;
      const ys = y - o.dy;
      const ghost = xs >= 0 && ys >= 0 && xs < w && ys < h ? (d0[ys * w + xs] as number) : 0;
      d[y * w + x] = (d0[y * w + x] as number) + g * ghost;
    }
  }
  return { data: d, width: w, height: h };
}

describe('ghost ratio: B = g·S1 − g²·S2 (docs/method.md §5.8)', () => {
  it('recovers g to third order on a uniform screen', () => {
    const s = { x: 60, y: 50, w: 120, h: 80 };
    for (const g of [0.01, 0.05, 0.15]) {
      const m = measureGhost(scene(300, 200, s, g, { dx: 9, dy: 6 }, false), { x: 0, y: 0 }, s, { dx: 9, dy: 6 });
      expect(Math.abs((m?.ratio as number) - g)).toBeLessThan(2 * g ** 3 + 1e-6);
    }
  });

  it('recovers g on a textured screen, where the first-order B/S1 is off by about g', () => {
    const s = { x: 60, y: 50, w: 120, h: 80 };
    const m = measureGhost(scene(300, 200, s, 0.1, { dx: -7, dy: 4 }, true), { x: 0, y: 0 }, s, { dx: -7, dy: 4 });
    expect(m?.ratio).toBeCloseTo(0.1, 2);
    expect(Math.abs((m?.firstOrder as number) - 0.1)).toBeGreaterThan(Math.abs((m?.ratio as number) - 0.1));
  });

  it('solves the quadratic and falls back to B/S1 when S2 vanishes', () => {
    expect(solveGhostRatio(0.02, 0.5, 0)).toBeCloseTo(0.04, 12);
    const g = 0.08;
    expect(solveGhostRatio(g * 0.5 - g * g * 0.45, 0.5, 0.45)).toBeCloseTo(g, 12);
    expect(() => solveGhostRatio(0.1, 0, 0)).toThrow(RangeError);
    expect(() => solveGhostRatio(Number.NaN, 1, 0)).toThrow(RangeError);
  });

  it('visits exactly the band pixels', () => {
    const r = { x: 10, y: 10, w: 20, h: 15 };
    for (const o of [{ dx: 3, dy: 2 }, { dx: -4, dy: 0 }, { dx: 0, dy: -5 }, { dx: 25, dy: 1 }]) {
      let n = 0;
      forEachBandPixel(r, o, (x, y) => {
        n++;
        expect(x >= r.x && x < r.x + r.w && y >= r.y && y < r.y + r.h).toBe(false);
      });
      expect(n).toBe(bandArea(r, o));
    }
  });
});

describe('ghost ratio read from strips', () => {
  it('gives measureGhost’s result to the last bit, with the strips cut by the image edge', () => {
    // a plane and its difference with a second one; the screen near the edges, so copies two offsets back leave the image
    const w = 260;
    const h = 190;
    const image = { x: 0, y: 0, w, h };
    const screen = { x: 25, y: 20, w: 150, h: 110 };
    for (const o of [{ dx: 9, dy: 6 }, { dx: -13, dy: 4 }, { dx: 7, dy: -11 }, { dx: 0, dy: 14 }, { dx: -16, dy: 0 }, { dx: -30, dy: -25 }]) {
      const a = scene(w, h, screen, 0.04, o, true);
      const b = { data: a.data.map((v, i) => 0.01 * Math.sin(i)), width: w, height: h };
      const crop = (p: { data: Float32Array }, r: { x: number; y: number; w: number; h: number }) => {
        const out = new Float32Array(r.w * r.h);
        for (let y = 0; y < r.h; y++) for (let x = 0; x < r.w; x++) out[y * r.w + x] = p.data[(r.y + y) * w + r.x + x] as number;
        return out;
      };
      const strips = bandRects(screen, o).map((r) =>
        [0, 1, 2].map((k): BandStrip | null => {
          const c = intersectRects(translateRect(r, -k * o.dx, -k * o.dy), image);
          return c ? { rect: c, data: crop(a, c), minus: crop(b, c) } : null;
        }),
      );
      const viaStrips = measureGhostStrips(screen, o, (j, k) => strips[j]?.[k] ?? null);
      const whole = measureGhost(a, { x: 0, y: 0 }, screen, o, b);
      expect(viaStrips).not.toBeNull();
      expect(viaStrips).toEqual(whole);
    }
  });
});

describe('ghost search', () => {
  it('finds the offset of a 3% ghost, including diagonal and negative ones', () => {
    const s = { x: 80, y: 60, w: 160, h: 120 };
    for (const o of [{ dx: 11, dy: 7 }, { dx: -6, dy: 13 }, { dx: 0, dy: -9 }]) {
      const c = searchGhost(scene(400, 300, s, 0.03, o, false), s, 2);
      expect(Math.round(c?.dx as number)).toBe(o.dx);
      expect(Math.round(c?.dy as number)).toBe(o.dy);
      // the search's gain is first order: the screen's own ghost light biases it by about g²
      expect(Math.abs((c?.gain as number) - 0.03)).toBeLessThan(0.002);
    }
  });

  it('reports a weak fit (low SNR) when there is no ghost, only noise', () => {
    const s = { x: 80, y: 60, w: 160, h: 120 };
    const p = scene(400, 300, s, 0, { dx: 1, dy: 1 }, false);
    let seed = 7;
    for (let i = 0; i < p.data.length; i++) {
      seed = (seed * 1103515245 + 12345) >>> 0;
      p.data[i] = (p.data[i] as number) + 0.002 * ((seed / 2 ** 32) - 0.5);
    }
    const c = searchGhost(p, s, 2);
    expect(c === null || c.snr < 8).toBe(true);
  });
});
