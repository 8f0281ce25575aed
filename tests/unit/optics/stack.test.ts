import { describe, expect, it } from 'vitest';
import { getStackTemplate, listStackTemplates, predictStack, STACK_TEMPLATE_IDS, stackSchema } from '@/lib/optics';

const display = { kind: 'display', luminance: 1000, polarisation: { kind: 'none' } };
const messages = (input: unknown) => {
  const r = stackSchema.safeParse(input);
  return r.success ? [] : r.error.issues.map((i) => i.message);
};

describe('stack schema', () => {
  it('accepts a valid birdbath', () => {
    const r = stackSchema.safeParse({
      elements: [
        display,
        { kind: 'plate-beam-splitter', R: 0.5, T: 0.5, angleDeg: 45, n: 1.52, back: { kind: 'ar', R: 0.005 } },
        { kind: 'combiner', shape: 'curved', R: 0.5, T: 0.5 },
      ],
    });
    expect(r.success).toBe(true);
  });
  it('refuses R + T > 1 with a message that says so', () => {
    const m = messages({ elements: [display, { kind: 'combiner', shape: 'flat', R: 0.6, T: 0.5 }] });
    expect(m.join(' ')).toMatch(/R \+ T must not exceed 1/);
  });
  it('accepts R + T = 1 despite rounding (0.1 + 0.9, 0.7 + 0.3)', () => {
    expect(messages({ elements: [display, { kind: 'combiner', shape: 'flat', R: 0.7, T: 0.3 }] })).toEqual([]);
    expect(messages({ elements: [display, { kind: 'combiner', shape: 'flat', R: 0.1, T: 0.9 }] })).toEqual([]);
  });
  it('refuses percentages, an index outside 1.0–2.5 and an angle outside 0–89°', () => {
    expect(messages({ elements: [display, { kind: 'combiner', shape: 'flat', R: 30, T: 70 }] }).join(' ')).toMatch(/between 0 and 1/);
    const sp = (over: object) => ({
      elements: [display, { kind: 'plate-beam-splitter', R: 0.5, T: 0.5, angleDeg: 45, n: 1.5, back: { kind: 'uncoated' }, ...over }],
    });
    expect(messages(sp({ n: 0.9 })).join(' ')).toMatch(/index n must be between 1.0 and 2.5/);
    expect(messages(sp({ n: 2.6 })).join(' ')).toMatch(/index n/);
    expect(messages(sp({ angleDeg: 90 })).join(' ')).toMatch(/angle must be between 0° and 89°/);
    expect(messages(sp({ angleDeg: -1 })).join(' ')).toMatch(/angle/);
    expect(messages(sp({ angleDeg: Number.NaN })).length).toBeGreaterThan(0);
    expect(messages(sp({ back: { kind: 'ar', R: 1.5 } })).join(' ')).toMatch(/AR residual/);
  });
  it('refuses a polariser with T2 above T1', () => {
    const m = messages({
      elements: [display, { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 }, { kind: 'linear-polariser', T1: 0.1, T2: 0.4, axisDeg: 0 }],
    });
    expect(m.join(' ')).toMatch(/T2/);
  });
  it('refuses stacks with no display, two displays, a display not first, or no reflector', () => {
    expect(messages({ elements: [{ kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 }, { kind: 'magnifier', T: 0.9 }] }).join(' ')).toMatch(/exactly one display/);
    expect(messages({ elements: [display, display, { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 }] }).join(' ')).toMatch(/exactly one display/);
    expect(messages({ elements: [{ kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 }, display] }).join(' ')).toMatch(/first element/);
    expect(messages({ elements: [display, { kind: 'magnifier', T: 0.9 }] }).join(' ')).toMatch(/plate beam splitter or a combiner/);
  });
  it('refuses an unknown element kind, a zero display luminance and a curved-or-flat typo', () => {
    expect(messages({ elements: [display, { kind: 'prism' }] }).length).toBeGreaterThan(0);
    expect(messages({ elements: [{ ...display, luminance: 0 }, { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 }] }).join(' ')).toMatch(/luminance/);
    expect(messages({ elements: [display, { kind: 'combiner', shape: 'round', R: 0.3, T: 0.7 }] }).join(' ')).toMatch(/flat or curved/);
  });
});

describe('starting templates', () => {
  it('are valid stacks, one for each id, with the expected layouts and handedness', () => {
    const all = listStackTemplates();
    expect(all.map((t) => t.id)).toEqual([...STACK_TEMPLATE_IDS]);
    for (const t of all) {
      expect(stackSchema.safeParse(t.stack).success).toBe(true);
      const p = predictStack(t.stack);
      const birdbath = t.id.startsWith('birdbath');
      expect(p.layout.kind).toBe(birdbath ? 'birdbath' : 'single-combiner');
      expect(p.handedness).toBe(birdbath ? 'kept' : 'mirrored');
      expect(p.eta).toBeGreaterThan(0);
      expect(p.tau).toBeGreaterThan(0);
      expect(p.ghost).not.toBeNull();
    }
  });
  it('a polariser variant raises the contrast ratio in bright surroundings', () => {
    for (const [plain, pol] of [
      ['single-combiner', 'single-combiner-polariser'],
      ['birdbath', 'birdbath-polariser'],
    ] as const) {
      const a = predictStack(getStackTemplate(plain).stack).curve.at(-1)!;
      const b = predictStack(getStackTemplate(pol).stack).curve.at(-1)!;
      expect(b.ratio).toBeGreaterThan(a.ratio);
    }
  });
  it('hands out copies, so editing one does not change the next', () => {
    const a = getStackTemplate('birdbath');
    (a.stack.elements[0] as { luminance: number }).luminance = 1;
    expect((getStackTemplate('birdbath').stack.elements[0] as { luminance: number }).luminance).not.toBe(1);
  });
  it('refuses an unknown id', () => {
    expect(() => getStackTemplate('periscope' as never)).toThrow(RangeError);
  });
});

describe('stack prediction', () => {
  it('gives the plate ghost of the splitter (2.51% for a bare 50/50 plate at 45°, n = 1.5; derived from the Fresnel equations, E. Hecht, Optics)', () => {
    const p = predictStack({
      elements: [
        { kind: 'display', luminance: 1000, polarisation: { kind: 'none' } },
        { kind: 'plate-beam-splitter', R: 0.5, T: 0.5, angleDeg: 45, n: 1.5, back: { kind: 'uncoated' } },
        { kind: 'combiner', shape: 'curved', R: 0.5, T: 0.5 },
      ],
    });
    expect(p.ghost?.unpolarised).toBeCloseTo(0.0251, 4);
    expect(p.curve[0]?.ratio).toBeCloseTo(1 + (0.125 * 1000) / (0.25 * 10), 9);
  });
  it('has no ghost for a combiner-only stack', () => {
    const p = predictStack({
      elements: [
        { kind: 'display', luminance: 1000, polarisation: { kind: 'none' } },
        { kind: 'combiner', shape: 'flat', R: 0.3, T: 0.7 },
      ],
    });
    expect(p.ghost).toBeNull();
  });
});
