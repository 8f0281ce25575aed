import { describe, expect, it } from 'vitest';
import {
  birdbathDisplayEfficiency,
  birdbathSeeThrough,
  detectLayout,
  handednessFromReflections,
  stackBudget,
  type Stack,
} from '@/lib/optics';

const display = { kind: 'display', luminance: 1000, polarisation: { kind: 'none' } } as const;
const splitter = (R: number, T: number) =>
  ({ kind: 'plate-beam-splitter', R, T, angleDeg: 45, n: 1.5, back: { kind: 'uncoated' } }) as const;
const combiner = (R: number, T: number) => ({ kind: 'combiner', shape: 'curved', R, T }) as const;

// Optical budget of a birdbath (docs/references.md: common practice; values derived).
describe('birdbath budget (docs/references.md optical budget of a birdbath; common practice, values derived)', () => {
  const cases = [
    { Rbs: 0.5, Rc: 0.5, eta: 0.125, tau: 0.25 },
    { Rbs: 0.5, Rc: 0.7, eta: 0.175, tau: 0.15 },
    { Rbs: 0.3, Rc: 0.5, eta: 0.105, tau: 0.35 },
  ];
  for (const c of cases) {
    it(`lossless R_bs ${c.Rbs}, R_c ${c.Rc} → η ${c.eta * 100}%, see-through ${c.tau * 100}%`, () => {
      const Tbs = 1 - c.Rbs;
      const Tc = 1 - c.Rc;
      expect(birdbathDisplayEfficiency(c.Rbs, Tbs, c.Rc)).toBeCloseTo(c.eta, 12);
      expect(birdbathSeeThrough(Tbs, Tc)).toBeCloseTo(c.tau, 12);
      const b = stackBudget({ elements: [display, splitter(c.Rbs, Tbs), combiner(c.Rc, Tc)] });
      expect(b.layout.kind).toBe('birdbath');
      expect(b.eta).toBeCloseTo(c.eta, 12);
      expect(b.etaReflectors).toBeCloseTo(c.eta, 12);
      expect(b.tau).toBeCloseTo(c.tau, 12);
      expect(b.displayAtEye).toBeCloseTo(c.eta * 1000, 9);
    });
  }
  it('R·T of a lossless splitter peaks at 0.25 at a 50/50 split, so η ≤ 0.25·R_c', () => {
    let best = 0;
    let bestR = 0;
    for (let i = 0; i <= 100; i++) {
      const R = i / 100;
      const eta = birdbathDisplayEfficiency(R, 1 - R, 1);
      if (eta > best) {
        best = eta;
        bestR = R;
      }
      expect(birdbathDisplayEfficiency(R, 1 - R, 0.6)).toBeLessThanOrEqual(0.25 * 0.6 + 1e-15);
    }
    expect(best).toBeCloseTo(0.25, 12);
    expect(bestR).toBeCloseTo(0.5, 12);
  });
  it('refuses fractions outside 0…1 and NaN', () => {
    expect(() => birdbathDisplayEfficiency(1.2, 0, 0.5)).toThrow(RangeError);
    expect(() => birdbathSeeThrough(Number.NaN, 0.5)).toThrow(RangeError);
  });
});

describe('single combiner budget', () => {
  it('has η = R and τ = T', () => {
    const b = stackBudget({ elements: [display, { kind: 'combiner', shape: 'flat', R: 0.25, T: 0.7 }] });
    expect(b.layout.kind).toBe('single-combiner');
    expect(b.eta).toBeCloseTo(0.25, 12);
    expect(b.tau).toBeCloseTo(0.7, 12);
    expect(b.reflections).toBe(1);
  });
  it('counts a lone plate beam splitter as a single combiner', () => {
    expect(detectLayout({ elements: [display, splitter(0.3, 0.7)] })).toEqual({ kind: 'single-combiner', reflectorIndex: 1 });
  });
  it('applies parts before the reflector to the display only and parts after it to both paths', () => {
    const b = stackBudget({
      elements: [
        display,
        { kind: 'magnifier', T: 0.9 },
        { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 },
        { kind: 'neutral-filter', T: 0.5 },
        { kind: 'neutral-filter', T: 0.8, worldOnly: true },
      ],
    });
    expect(b.eta).toBeCloseTo(0.9 * 0.3 * 0.5, 12);
    expect(b.etaReflectors).toBeCloseTo(0.3, 12);
    expect(b.tau).toBeCloseTo(0.7 * 0.5 * 0.8, 12);
  });
});

// Polarisers in a stack: an ideal polariser passes half of unpolarised light, Malus's law for
// polarised light (published: docs/references.md Polarisers).
describe('polarisers in a stack (published: Malus\'s law; docs/references.md Polarisers)', () => {
  const polarised = (angleDeg: number) => ({ kind: 'display', luminance: 1000, polarisation: { kind: 'linear', angleDeg } }) as const;
  it('an ideal eye-side polariser halves the unpolarised world and passes an aligned polarised display', () => {
    const b = stackBudget({
      elements: [polarised(0), { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 }, { kind: 'linear-polariser', T1: 1, T2: 0, axisDeg: 0 }],
    });
    expect(b.eta).toBeCloseTo(0.3, 12);
    expect(b.tau).toBeCloseTo(0.35, 12);
  });
  it('follows Malus for a display polarised at 60° to the polariser axis (0.25)', () => {
    const b = stackBudget({
      elements: [polarised(60), { kind: 'combiner', shape: 'flat', R: 0.4, T: 0.6 }, { kind: 'linear-polariser', T1: 1, T2: 0, axisDeg: 0 }],
    });
    expect(b.eta).toBeCloseTo(0.4 * 0.25, 12);
  });
  it('two ideal polarisers at 45° on the world path pass 25% of it', () => {
    const b = stackBudget({
      elements: [
        display,
        { kind: 'combiner', shape: 'flat', R: 0, T: 1 },
        { kind: 'linear-polariser', T1: 1, T2: 0, axisDeg: 0 },
        { kind: 'linear-polariser', T1: 1, T2: 0, axisDeg: 45 },
      ],
    });
    expect(b.tau).toBeCloseTo(0.25, 12);
  });
  it('a world-only polariser dims the world but not the display of a birdbath', () => {
    const base = stackBudget({ elements: [display, splitter(0.5, 0.5), combiner(0.5, 0.5)] });
    const withPol = stackBudget({
      elements: [display, splitter(0.5, 0.5), combiner(0.5, 0.5), { kind: 'linear-polariser', T1: 1, T2: 0, axisDeg: 0, worldOnly: true }],
    });
    expect(withPol.eta).toBeCloseTo(base.eta, 12);
    expect(withPol.tau).toBeCloseTo(base.tau / 2, 12);
  });
  it('a part between a birdbath splitter and combiner is crossed twice by the display and once by the world', () => {
    const b = stackBudget({ elements: [display, splitter(0.5, 0.5), { kind: 'neutral-filter', T: 0.9 }, combiner(0.5, 0.5)] });
    expect(b.eta).toBeCloseTo(0.125 * 0.81, 12);
    expect(b.tau).toBeCloseTo(0.25 * 0.9, 12);
  });
});

// Reflection parity (docs/references.md: common practice): two reflections keep handedness, an odd count mirrors.
describe('image handedness from reflection parity (docs/references.md birdbath notes; common practice)', () => {
  it('keeps the image after an even number of reflections and mirrors it after an odd number', () => {
    expect(handednessFromReflections(0)).toBe('kept');
    expect(handednessFromReflections(1)).toBe('mirrored');
    expect(handednessFromReflections(2)).toBe('kept');
    expect(handednessFromReflections(3)).toBe('mirrored');
  });
  it('gives a birdbath two reflections and a single combiner one', () => {
    expect(stackBudget({ elements: [display, splitter(0.5, 0.5), combiner(0.5, 0.5)] }).reflections).toBe(2);
    expect(stackBudget({ elements: [display, splitter(0.5, 0.5)] }).reflections).toBe(1);
  });
  it('refuses negative, fractional and NaN counts', () => {
    expect(() => handednessFromReflections(-1)).toThrow(RangeError);
    expect(() => handednessFromReflections(1.5)).toThrow(RangeError);
    expect(() => handednessFromReflections(Number.NaN)).toThrow(RangeError);
  });
});

describe('layout detection', () => {
  it('refuses a stack with a combiner before the splitter or two combiners', () => {
    const bad1 = { elements: [display, combiner(0.5, 0.5), splitter(0.5, 0.5)] } as Stack;
    const bad2 = { elements: [display, combiner(0.5, 0.5), combiner(0.5, 0.5)] } as Stack;
    const bad3 = { elements: [display, { kind: 'magnifier', T: 0.9 }] } as Stack;
    expect(() => detectLayout(bad1)).toThrow(RangeError);
    expect(() => detectLayout(bad2)).toThrow(RangeError);
    expect(() => detectLayout(bad3)).toThrow(RangeError);
  });
});
