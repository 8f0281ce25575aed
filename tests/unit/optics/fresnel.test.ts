import { describe, expect, it } from 'vitest';
import {
  brewsterAngle,
  criticalAngle,
  fresnelReflectance,
  fresnelRp,
  fresnelRs,
  normalIncidenceReflectance,
} from '@/lib/optics';

// Fresnel equations (published: E. Hecht, Optics; values derived) — docs/references.md Fresnel table.
describe('Fresnel reflectance against the docs/references.md table (Fresnel equations, published: E. Hecht, Optics; values derived)', () => {
  const rows = [
    { n: 1.5, normal: 0.04, rs45: 0.092013, rp45: 0.008466, brewster: 56.3099 },
    { n: 1.52, normal: 0.04258, rs45: 0.096733, rp45: 0.009357, brewster: 56.6593 },
  ];
  for (const r of rows) {
    it(`gives R at normal incidence for n = ${r.n} of ${r.normal}`, () => {
      expect(normalIncidenceReflectance(r.n)).toBeCloseTo(r.normal, 6);
      const f = fresnelReflectance(0, r.n);
      expect(f.s).toBeCloseTo(r.normal, 6);
      expect(f.p).toBeCloseTo(r.normal, 6);
      expect(f.unpolarised).toBeCloseTo(r.normal, 6);
    });
    it(`gives Rs ${r.rs45} and Rp ${r.rp45} at 45° for n = ${r.n}`, () => {
      expect(fresnelRs(45, r.n)).toBeCloseTo(r.rs45, 6);
      expect(fresnelRp(45, r.n)).toBeCloseTo(r.rp45, 6);
      expect(fresnelReflectance(45, r.n).unpolarised).toBeCloseTo((r.rs45 + r.rp45) / 2, 6);
    });
    it(`puts the Brewster angle for n = ${r.n} at ${r.brewster}° where Rp vanishes`, () => {
      expect(brewsterAngle(r.n)).toBeCloseTo(r.brewster, 4);
      expect(fresnelRp(brewsterAngle(r.n), r.n)).toBeLessThan(1e-20);
      expect(fresnelRs(brewsterAngle(r.n), r.n)).toBeGreaterThan(0.1);
    });
  }
});

describe('Fresnel reflectance edge cases', () => {
  it('reflects everything beyond the critical angle inside glass (total internal reflection)', () => {
    const crit = criticalAngle(1.5);
    expect(crit).not.toBeNull();
    expect(crit!).toBeCloseTo(41.8103, 4);
    expect(fresnelReflectance(45, 1, 1.5)).toEqual({ s: 1, p: 1, unpolarised: 1 });
    expect(fresnelReflectance(41, 1, 1.5).s).toBeLessThan(1);
  });
  it('has no critical angle going into a denser medium', () => {
    expect(criticalAngle(1, 1.5)).toBeNull();
  });
  it('reflects everything at grazing incidence', () => {
    const f = fresnelReflectance(90, 1.5);
    expect(f.s).toBeCloseTo(1, 12);
    expect(f.p).toBeCloseTo(1, 12);
  });
  it('reflects nothing between equal indices', () => {
    expect(fresnelReflectance(30, 1.33, 1.33).unpolarised).toBeLessThan(1e-30);
  });
  it('gives the same reflectance from inside at the refracted angle (reciprocity)', () => {
    const out = fresnelReflectance(45, 1.5);
    const inside = (Math.asin(Math.sin(Math.PI / 4) / 1.5) * 180) / Math.PI;
    const back = fresnelReflectance(inside, 1, 1.5);
    expect(back.s).toBeCloseTo(out.s, 12);
    expect(back.p).toBeCloseTo(out.p, 12);
  });
  it('keeps Rs ≥ Rp for external reflection at every angle', () => {
    for (let a = 0; a <= 89; a += 7) {
      const f = fresnelReflectance(a, 1.7);
      expect(f.s).toBeGreaterThanOrEqual(f.p - 1e-15);
    }
  });
  it('refuses bad arguments with a RangeError', () => {
    expect(() => fresnelReflectance(Number.NaN, 1.5)).toThrow(RangeError);
    expect(() => fresnelReflectance(-1, 1.5)).toThrow(RangeError);
    expect(() => fresnelReflectance(91, 1.5)).toThrow(RangeError);
    expect(() => fresnelReflectance(10, 0)).toThrow(RangeError);
    expect(() => brewsterAngle(-1)).toThrow(RangeError);
    expect(() => normalIncidenceReflectance(Number.POSITIVE_INFINITY)).toThrow(RangeError);
  });
});
