import { describe, expect, it } from 'vitest';
import {
  chainTransmittance,
  degreeOfLinearPolarisation,
  linearLight,
  malus,
  polarisationAngle,
  polariserDegreeOfPolarisation,
  polariserExtinctionRatio,
  polariserPolarisedTransmittance,
  polariserSingleTransmittance,
  throughChain,
  throughPolariser,
  unpolarisedLight,
} from '@/lib/optics';

// Malus's law (published; docs/references.md Polarisers): θ = 0/30/45/60/90° → 1.000/0.750/0.500/0.250/0.
describe("Malus's law (published: Malus's law, docs/references.md Polarisers)", () => {
  const table: [number, number][] = [
    [0, 1],
    [30, 0.75],
    [45, 0.5],
    [60, 0.25],
    [90, 0],
  ];
  for (const [deg, frac] of table) {
    it(`passes ${frac} at ${deg}°`, () => {
      expect(malus(deg)).toBeCloseTo(frac, 12);
      expect(chainTransmittance(linearLight(1, deg), [{ kind: 'polariser', T1: 1, T2: 0, axisDeg: 0 }])).toBeCloseTo(frac, 12);
    });
  }
  it('refuses NaN', () => {
    expect(() => malus(Number.NaN)).toThrow(RangeError);
  });
});

describe('ideal polarisers on unpolarised light (published: docs/references.md Polarisers)', () => {
  it('an ideal polariser passes 50% of unpolarised light', () => {
    expect(chainTransmittance(unpolarisedLight(), [{ kind: 'polariser', T1: 1, T2: 0, axisDeg: 17 }])).toBeCloseTo(0.5, 12);
  });
  it('two ideal polarisers at 45° pass 25%', () => {
    const t = chainTransmittance(unpolarisedLight(), [
      { kind: 'polariser', T1: 1, T2: 0, axisDeg: 0 },
      { kind: 'polariser', T1: 1, T2: 0, axisDeg: 45 },
    ]);
    expect(t).toBeCloseTo(0.25, 12);
  });
  it('crossed ideal polarisers pass nothing, and a third at 45° between them lets 12.5% through', () => {
    const crossed = chainTransmittance(unpolarisedLight(), [
      { kind: 'polariser', T1: 1, T2: 0, axisDeg: 0 },
      { kind: 'polariser', T1: 1, T2: 0, axisDeg: 90 },
    ]);
    expect(crossed).toBeCloseTo(0, 12);
    const three = chainTransmittance(unpolarisedLight(), [
      { kind: 'polariser', T1: 1, T2: 0, axisDeg: 0 },
      { kind: 'polariser', T1: 1, T2: 0, axisDeg: 45 },
      { kind: 'polariser', T1: 1, T2: 0, axisDeg: 90 },
    ]);
    expect(three).toBeCloseTo(0.125, 12);
  });
  it('leaves fully polarised light along its axis', () => {
    const out = throughPolariser(unpolarisedLight(2), 1, 0, 30);
    expect(out.s0).toBeCloseTo(1, 12);
    expect(degreeOfLinearPolarisation(out)).toBeCloseTo(1, 12);
    expect(polarisationAngle(out)).toBeCloseTo(30, 10);
    expect(polarisationAngle(unpolarisedLight())).toBeNull();
  });
  it('multiplies by a neutral element', () => {
    expect(throughChain(linearLight(1, 10), [{ kind: 'neutral', T: 0.4 }]).s0).toBeCloseTo(0.4, 12);
  });
});

// Polariser definitions after the Handbook of Optics (published; docs/references.md Polarisers).
describe('principal transmittances T1, T2 (published: polariser definitions after the Handbook of Optics)', () => {
  it('single transmittance (T1 + T2)/2, degree of polarisation (T1 − T2)/(T1 + T2), extinction T2/T1', () => {
    expect(polariserSingleTransmittance(0.86, 0.0004)).toBeCloseTo(0.4302, 12);
    expect(polariserDegreeOfPolarisation(0.86, 0.0004)).toBeCloseTo(0.8596 / 0.8604, 12);
    expect(polariserExtinctionRatio(0.86, 0.0004)).toBeCloseTo(0.0004 / 0.86, 12);
  });
  it('a real iodine-type sheet of T1 0.87, T2 0.002 lands in the quoted 42–44% single transmittance at ≥ 99% polarisation (published: US patent 6,606,136)', () => {
    expect(polariserSingleTransmittance(0.87, 0.002)).toBeGreaterThanOrEqual(0.42);
    expect(polariserSingleTransmittance(0.87, 0.002)).toBeLessThanOrEqual(0.44);
    expect(polariserDegreeOfPolarisation(0.87, 0.002)).toBeGreaterThanOrEqual(0.99);
  });
  it('the diattenuator chain agrees with (T1 + T2)/2 for unpolarised and T1cos² + T2sin² for polarised input', () => {
    const T1 = 0.8;
    const T2 = 0.05;
    expect(chainTransmittance(unpolarisedLight(), [{ kind: 'polariser', T1, T2, axisDeg: 33 }])).toBeCloseTo(0.425, 12);
    for (const a of [0, 20, 45, 70, 90, 135]) {
      const chain = chainTransmittance(linearLight(1, a), [{ kind: 'polariser', T1, T2, axisDeg: 10 }]);
      expect(chain).toBeCloseTo(polariserPolarisedTransmittance(T1, T2, a - 10), 12);
    }
  });
  it('real polarisers never make light more than fully polarised', () => {
    let light = unpolarisedLight();
    for (const axis of [0, 30, 75, 110]) {
      light = throughPolariser(light, 0.9, 0.02, axis);
      expect(degreeOfLinearPolarisation(light)).toBeLessThanOrEqual(1 + 1e-12);
    }
  });
  it('refuses T2 > T1, values outside 0…1, opaque sheets and NaN with a RangeError', () => {
    expect(() => polariserSingleTransmittance(0.1, 0.2)).toThrow(RangeError);
    expect(() => polariserSingleTransmittance(1.1, 0)).toThrow(RangeError);
    expect(() => polariserDegreeOfPolarisation(0, 0)).toThrow(RangeError);
    expect(() => polariserExtinctionRatio(0, 0)).toThrow(RangeError);
    expect(() => polariserPolarisedTransmittance(0.8, 0.01, Number.NaN)).toThrow(RangeError);
    expect(() => throughPolariser(unpolarisedLight(), 0.2, 0.5, 0)).toThrow(RangeError);
    expect(() => chainTransmittance(unpolarisedLight(0), [])).toThrow(RangeError);
    expect(() => unpolarisedLight(-1)).toThrow(RangeError);
  });
});
