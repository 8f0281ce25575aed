import { describe, expect, it } from 'vitest';
import { fresnelReflectance, ghostToPrimary, plateGhost, plateSums, uncoatedPlate } from '@/lib/optics';

// Fresnel equations (published: E. Hecht, Optics; values derived) with the incoherent plate sum.
describe('uncoated thick plate (docs/references.md Fresnel table; published: E. Hecht, Optics; values derived)', () => {
  it('reflects 0.076923 at normal incidence for n = 1.5 and 0.081682 for n = 1.52', () => {
    expect(uncoatedPlate(0, 1.5).unpolarised.R).toBeCloseTo(0.076923, 6);
    expect(uncoatedPlate(0, 1.52).unpolarised.R).toBeCloseTo(0.081682, 6);
  });
  it('reflects s 0.168521 / p 0.016791 at 45° for n = 1.5', () => {
    const p = uncoatedPlate(45, 1.5);
    expect(p.s.R).toBeCloseTo(0.168521, 6);
    expect(p.p.R).toBeCloseTo(0.016791, 6);
  });
  it('reflects s 0.176402 / p 0.018541 at 45° for n = 1.52', () => {
    const p = uncoatedPlate(45, 1.52);
    expect(p.s.R).toBeCloseTo(0.176402, 6);
    expect(p.p.R).toBeCloseTo(0.018541, 6);
  });
  it('averages per polarisation after the plate formula: 0.092656 (n 1.5) and 0.097472 (n 1.52), not the wrong 0.0957', () => {
    expect(uncoatedPlate(45, 1.5).unpolarised.R).toBeCloseTo(0.092656, 6);
    expect(uncoatedPlate(45, 1.52).unpolarised.R).toBeCloseTo(0.097472, 6);
    // The wrong order (average the faces first), which docs/references.md warns gives 0.0957 (n = 1.5).
    const f = fresnelReflectance(45, 1.5).unpolarised;
    const wrong = plateSums(f, 1 - f, f, 1 - f).R;
    expect(wrong).toBeCloseTo(0.0957, 4);
    expect(Math.abs(uncoatedPlate(45, 1.5).unpolarised.R - wrong)).toBeGreaterThan(1e-3);
  });
  it('conserves energy without absorption (R + T = 1) and loses light with it', () => {
    for (const a of [0, 30, 45, 60, 80]) {
      const p = uncoatedPlate(a, 1.6);
      expect(p.s.R + p.s.T).toBeCloseTo(1, 12);
      expect(p.p.R + p.p.T).toBeCloseTo(1, 12);
    }
    const lossy = uncoatedPlate(0, 1.5, 0.9);
    expect(lossy.unpolarised.R + lossy.unpolarised.T).toBeLessThan(1);
  });
  it('handles a perfect mirror on both faces without dividing by zero', () => {
    expect(plateSums(1, 0, 1, 0)).toEqual({ R: 1, T: 0 });
  });
  it('refuses R + T above 1 and NaN with a RangeError', () => {
    expect(() => plateSums(0.6, 0.6, 0.04, 0.96)).toThrow(RangeError);
    expect(() => plateSums(Number.NaN, 0.5, 0.04, 0.96)).toThrow(RangeError);
    expect(() => uncoatedPlate(45, 1.5, 1.2)).toThrow(RangeError);
  });
});

// Plate beam splitter ghost T_f²·R_b/R_f — docs/references.md (derived from the Fresnel equations, E. Hecht, Optics).
describe('plate beam splitter ghost-to-primary ratio (docs/references.md plate ghost figures; derived)', () => {
  it('is 2.00% for a 50/50 front, n = 1.5, normal incidence, bare back', () => {
    const g = plateGhost({ R: 0.5, T: 0.5, angleDeg: 0, n: 1.5, back: { kind: 'uncoated' } });
    expect(g.unpolarised).toBeCloseTo(0.02, 6);
    expect(g.s).toBeCloseTo(g.p, 12);
  });
  it('is 2.51% unpolarised at 45°, s 4.60%, p 0.42%, for n = 1.5', () => {
    const g = plateGhost({ R: 0.5, T: 0.5, angleDeg: 45, n: 1.5, back: { kind: 'uncoated' } });
    expect(g.unpolarised * 100).toBeCloseTo(2.51, 2);
    expect(g.s * 100).toBeCloseTo(4.6, 2);
    expect(g.p * 100).toBeCloseTo(0.42, 2);
  });
  it('is 2.65% unpolarised at 45° for n = 1.52', () => {
    const g = plateGhost({ R: 0.5, T: 0.5, angleDeg: 45, n: 1.52, back: { kind: 'uncoated' } });
    expect(g.unpolarised * 100).toBeCloseTo(2.65, 2);
  });
  it('falls to 0.25% with the back AR-coated to 0.5%, the same for s and p', () => {
    const g = plateGhost({ R: 0.5, T: 0.5, angleDeg: 45, n: 1.5, back: { kind: 'ar', R: 0.005 } });
    expect(g.unpolarised).toBeCloseTo(0.0025, 9);
    expect(g.s).toBe(g.p);
  });
  it('grows as the front reflects less (a 30/70 front ghosts more than 50/50)', () => {
    expect(ghostToPrimary(0.3, 0.7, 0.04)).toBeGreaterThan(ghostToPrimary(0.5, 0.5, 0.04));
    expect(ghostToPrimary(0.3, 0.7, 0.04)).toBeCloseTo((0.49 * 0.04) / 0.3, 12);
  });
  it('refuses a front that reflects nothing, R + T > 1, NaN and an angle of 90°', () => {
    expect(() => ghostToPrimary(0, 1, 0.04)).toThrow(RangeError);
    expect(() => ghostToPrimary(0.6, 0.6, 0.04)).toThrow(RangeError);
    expect(() => ghostToPrimary(0.5, 0.5, Number.NaN)).toThrow(RangeError);
    expect(() => plateGhost({ R: 0.5, T: 0.5, angleDeg: 90, n: 1.5, back: { kind: 'uncoated' } })).toThrow(RangeError);
  });
});
