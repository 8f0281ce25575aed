import { describe, expect, it } from 'vitest';
import { curveOf, fineFrequency, meanMtf, slantedEdgeMtf, transposePlane, type EdgeMtf } from '../../../lib/photometry/sharpness';
import { gaussianMtf, gaussianMtf50, gaussianPixelMtf, halfFrequency, renderSlantedEdge } from '../../fixtures/slanted-edge';

const edge = (o: Partial<Parameters<typeof renderSlantedEdge>[0]> = {}) =>
  renderSlantedEdge({ width: 96, height: 200, angleDeg: 5, sigma: 1, dark: 0.05, bright: 0.8, noise: 0.01, seed: 7, sampling: 'point', ...o });

const measured = (o: Partial<Parameters<typeof renderSlantedEdge>[0]> = {}): EdgeMtf => {
  const r = slantedEdgeMtf(edge(o));
  if (!r.ok) throw new Error(r.reason);
  return r.edge;
};

describe('slanted-edge MTF (docs/method.md §5.10)', () => {
  // Gaussian blur: MTF exp(−2π²σ²f²), MTF50 = √(ln 2 / (2π²σ²)) (derived)
  for (const sigma of [0.7, 1, 1.5, 2, 3]) {
    it(`reads MTF50 of a Gaussian blur σ = ${sigma} px within 3% through 1% noise`, () => {
      const e = measured({ sigma, width: sigma > 2 ? 128 : 96, seed: Math.round(sigma * 10) });
      expect(Math.abs(e.mtf50 / gaussianMtf50(sigma) - 1)).toBeLessThan(0.03);
      // and the curve up to where the MTF falls to 0.1
      for (let k = 1; fineFrequency(k) < 1 && gaussianMtf(sigma, fineFrequency(k)) > 0.1; k += 8) {
        expect(Math.abs((e.fine[k] as number) - gaussianMtf(sigma, fineFrequency(k)))).toBeLessThan(0.03);
      }
    });
  }

  it('finds the edge angle within 0.05°, for either slant and either polarity', () => {
    expect(Math.abs(measured({ angleDeg: 5 }).angleDeg - 5)).toBeLessThan(0.05);
    expect(Math.abs(measured({ angleDeg: -4 }).angleDeg + 4)).toBeLessThan(0.05);
    const flipped = measured({ angleDeg: 7, dark: 0.8, bright: 0.05 });
    expect(Math.abs(flipped.angleDeg - 7)).toBeLessThan(0.05);
    expect(Math.abs(flipped.mtf50 / gaussianMtf50(1) - 1)).toBeLessThan(0.03);
  });

  it('includes the camera pixel aperture when the pixels average the image over their area', () => {
    // Gaussian × sinc(f cos θ)·sinc(f sin θ) (derived), the MTF a real sensor records
    for (const sigma of [0.7, 1.5]) {
      const e = measured({ sigma, sampling: 'area', seed: 3 });
      const expected = halfFrequency((f) => gaussianPixelMtf(sigma, f, 5));
      expect(Math.abs(e.mtf50 / expected - 1)).toBeLessThan(0.03);
      // the aperture lowers MTF50 clearly below the Gaussian's own at small blur
      if (sigma === 0.7) expect(e.mtf50).toBeLessThan(0.95 * gaussianMtf50(sigma));
    }
  });

  it('reads a near-horizontal edge after turning the plane', () => {
    const vertical = edge({ sigma: 1.5, seed: 9 });
    const r = slantedEdgeMtf(transposePlane(transposePlane(vertical)));
    expect(r.ok && Math.abs(r.edge.mtf50 / gaussianMtf50(1.5) - 1)).toBeLessThan(0.03);
  });

  it('averages several edges into one curve', () => {
    const a = measured({ sigma: 1, seed: 1 });
    const b = measured({ sigma: 2, seed: 2 });
    const m = meanMtf([a, b]);
    expect(m.fine[40]).toBeCloseTo(((a.fine[40] as number) + (b.fine[40] as number)) / 2, 12);
    expect(m.mtf50).toBeGreaterThan(b.mtf50);
    expect(m.mtf50).toBeLessThan(a.mtf50);
    const curve = curveOf(m.fine);
    expect(curve[0]).toEqual({ f: 0, mtf: 1 });
    expect(curve.length).toBe(101);
    expect(curve.at(-1)?.f).toBe(1);
  });

  it('refuses an edge that does not slant, a flat region and a region without room on both sides', () => {
    const straight = slantedEdgeMtf(edge({ angleDeg: 0 }));
    expect(straight.ok).toBe(false);
    expect(!straight.ok && straight.reason).toMatch(/slant/);
    const flat = slantedEdgeMtf(edge({ dark: 0.5, bright: 0.5, noise: 0 }));
    expect(flat.ok).toBe(false);
    const side = slantedEdgeMtf(edge({ at: 3 }));
    expect(side.ok).toBe(false);
    expect(() => slantedEdgeMtf({ data: new Float32Array(10), width: 5, height: 3 })).toThrow(RangeError);
  });
});
