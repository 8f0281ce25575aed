import { describe, expect, it } from 'vitest';
import { getStackTemplate, predictStack, predictedContrastRatio } from '../../../lib/optics';
import type { MeasuredPoint } from '../../../components/stack/planner-model';
import { newElement } from '../../../components/stack/planner-model';
import {
  applyVariantChange,
  backgroundOf,
  fromVariantDrafts,
  handednessCheck,
  placeMeasured,
  plannerVariants,
  predictedAgainstMeasuredByVariant,
  readVariantStacks,
  variantStack,
} from '../../../components/stack/workbench-model';

// Invented readings; the stacks are the planner's own templates.
const point = (over: Partial<MeasuredPoint>): MeasuredPoint => ({ captureSetId: 'c', variant: '', backgroundCdm2: null, photoBackground: null, ambientContrastRatio: 2, ghostRatio: 0.01, transmission: 0.4, ...over });
const withPolariser = getStackTemplate('birdbath-polariser').stack;
const polariserAt = withPolariser.elements.findIndex((e) => e.kind === 'linear-polariser');

describe('where a reading goes on the chart', () => {
  it('prefers a typed background, then a calibrated one, then the EXIF estimate, marked', () => {
    expect(backgroundOf(point({ backgroundCdm2: 1500, photoBackground: { cdm2: 900, kind: 'calibrated' } }))).toEqual({ cdm2: 1500, source: 'typed' });
    expect(backgroundOf(point({ photoBackground: { cdm2: 900, kind: 'calibrated' } }))).toEqual({ cdm2: 900, source: 'calibrated' });
    expect(backgroundOf(point({ photoBackground: { cdm2: 729.7, kind: 'rough-estimate' } }))).toEqual({ cdm2: 729.7, source: 'estimate' });
    expect(backgroundOf(point({}))).toBeNull();
  });

  it('plots readings without a typed background from their estimate instead of leaving them off', () => {
    const { plotted, unplotted } = placeMeasured([
      point({ captureSetId: 'a', variant: 'with polarizer', photoBackground: { cdm2: 729.7, kind: 'rough-estimate' } }),
      point({ captureSetId: 'b', backgroundCdm2: 1500 }),
      point({ captureSetId: 'c' }),
      point({ captureSetId: 'd', backgroundCdm2: 90_000 }),
      point({ captureSetId: 'e', ambientContrastRatio: null, backgroundCdm2: 100 }),
    ]);
    expect(plotted.map((p) => [p.x, p.estimate, p.label])).toEqual([
      [729.7, true, 'with polarizer (background estimated from EXIF)'],
      [1500, false, 'reading'],
    ]);
    expect(unplotted.map((u) => u.why)).toEqual(['no background luminance recorded, and no exposure data to estimate it', 'background 90,000 cd/m² is off the chart', 'no contrast ratio']);
  });
});

describe('a stack per variant', () => {
  it('applies a variant as a change to the base stack', () => {
    const without = applyVariantChange(withPolariser, { without: [polariserAt], add: [] });
    expect(without.elements.some((e) => e.kind === 'linear-polariser')).toBe(false);
    expect(without.elements).toHaveLength(withPolariser.elements.length - 1);
    expect(applyVariantChange(withPolariser, undefined)).toBe(withPolariser);
  });

  it('refuses a variant whose stack the planner cannot model, in words', () => {
    const display = withPolariser.elements.findIndex((e) => e.kind === 'display');
    expect(variantStack(withPolariser, { without: [display], add: [] })).toMatchObject({ stack: null, error: expect.stringMatching(/display/) });
    expect(variantStack(null, undefined).error).toMatch(/base stack/);
  });

  it('reads stored variants defensively and offers measured and stored ones', () => {
    const stored = readVariantStacks({ 'without polarizer': { without: [polariserAt], add: [] }, broken: { without: ['x'] } });
    expect(Object.keys(stored)).toEqual(['without polarizer']);
    expect(plannerVariants([{ variant: 'with polarizer' }, { variant: '' }], stored)).toEqual(['with polarizer', 'without polarizer']);
  });

  it('turns form drafts into stored changes, dropping empty variants and positions past the end', () => {
    const { value, errors } = fromVariantDrafts({ a: { without: [], add: [] }, b: { without: [1, 99], add: [newElement('neutral-filter')] } }, 4);
    expect(errors).toEqual({});
    expect(Object.keys(value!)).toEqual(['b']);
    expect(value!.b!.without).toEqual([1]);
    expect(value!.b!.add[0]!.kind).toBe('neutral-filter');
    const bad = newElement('neutral-filter');
    bad.values.T = '1.5';
    expect(fromVariantDrafts({ c: { without: [], add: [bad] } }, 4).value).toBeNull();
  });

  it('compares each variant’s own stack with its own readings, never a blend', () => {
    const stored = { 'without polarizer': { without: [polariserAt], add: [] } };
    const measured = [
      point({ variant: 'with polarizer', backgroundCdm2: 1000, ambientContrastRatio: 3.0, transmission: 0.2 }),
      point({ variant: 'with polarizer', backgroundCdm2: 2000, ambientContrastRatio: 2.6, transmission: 0.22 }),
      point({ variant: 'without polarizer', backgroundCdm2: 1500, ambientContrastRatio: 2.0, transmission: 0.4 }),
    ];
    const rows = predictedAgainstMeasuredByVariant(withPolariser, stored, measured);
    expect(rows.map((r) => [r.variant, r.readings, r.background])).toEqual([
      ['with polarizer', 2, 1500],
      ['without polarizer', 1, 1500],
    ]);
    const p1 = predictStack(withPolariser);
    const p2 = predictStack(applyVariantChange(withPolariser, stored['without polarizer']));
    const display = withPolariser.elements[0]!;
    if (display.kind !== 'display') throw new Error('the template starts with its display');
    expect(rows[0]!.tauPredicted).toBe(p1.tau);
    expect(rows[1]!.tauPredicted).toBe(p2.tau);
    expect(rows[1]!.tauPredicted!).toBeGreaterThan(rows[0]!.tauPredicted!); // the polariser dims the world
    expect(rows[0]!.acrPredicted).toBe(predictedContrastRatio(p1.eta, display.luminance, p1.tau, 1500));
    expect(rows[0]!.acrMeasured).toBeCloseTo(2.8, 12);
    expect(rows[1]!.acrMeasured).toBe(2.0);
  });
});

describe('the stack fitted to the readings', () => {
  it('gives the display at the eye and the η that explain the readings, with a Student’s t interval', async () => {
    const { fitFromReadings } = await import('../../../components/stack/workbench-model');
    const { summarise } = await import('../../../lib/stats');
    // invented: η·L_display = 100 cd/m² exactly, read through τ = 0.4 at three backgrounds
    const rs = [500, 1000, 2000].map((bg, i) => point({ captureSetId: `f${i}`, backgroundCdm2: bg, transmission: 0.4, ambientContrastRatio: 1 + 100 / (0.4 * bg) * (1 + (i - 1) * 0.05) }));
    const fit = fitFromReadings(rs, 1000);
    const per = rs.map((r) => (r.ambientContrastRatio! - 1) * 0.4 * r.backgroundCdm2!);
    expect(fit.n).toBe(3);
    expect(fit.atEye!.mean).toBeCloseTo(100, 9);
    expect(fit.atEye!.halfWidth).toBeCloseTo(summarise(per).ci!.halfWidth, 12);
    expect(fit.eta!.mean).toBeCloseTo(0.1, 12);
    expect(fit.estimated).toBe(false);
    // a reading without a transmission or a background cannot be used
    expect(fitFromReadings([point({ transmission: null, backgroundCdm2: 100 }), point({})], 1000)).toMatchObject({ n: 0, atEye: null });
  });
});

describe('the trade-off view', () => {
  it('puts the common splits and the stack’s own, with and without a polariser, at the team’s background', async () => {
    const { tradeOffPoints } = await import('../../../components/stack/workbench-model');
    const { applyWhatIf } = await import('../../../components/stack/planner-model');
    const base = getStackTemplate('birdbath').stack;
    const pts = tradeOffPoints(base, 1000);
    const splits = [...new Set(pts.map((p) => p.split))];
    expect(splits.slice(0, 3)).toEqual(['50/50', '40/60', '30/70']);
    expect(pts.filter((p) => p.kind === 'own').length).toBeGreaterThanOrEqual(2);
    // each point is the planner's own prediction of that stack (docs/method.md §6)
    const one = pts.find((p) => p.split === '40/60' && p.polariser)!;
    const p = predictStack(applyWhatIf(base, { splitterR: 0.4, combinerR: null, displayLuminance: null, polariser: true }));
    const display = base.elements[0]!;
    if (display.kind !== 'display') throw new Error('the template starts with its display');
    expect(one.tau).toBe(p.tau);
    expect(one.acr).toBe(predictedContrastRatio(p.eta, display.luminance, p.tau, 1000));
    // the polariser trades see-through for contrast at every split
    for (const s of splits) {
      const no = pts.find((x) => x.split === s && !x.polariser)!;
      const yes = pts.find((x) => x.split === s && x.polariser)!;
      expect(yes.tau).toBeLessThan(no.tau);
      expect(yes.acr).toBeGreaterThan(no.acr);
    }
    expect(tradeOffPoints(null, 1000)).toEqual([]);
  });
});

describe('measured orientation beside the predicted handedness', () => {
  const seen = (orientation: 'normal' | 'mirrored' | 'upside-down-mirrored' | 'rotated-180', margin = 0.5) => ({ orientation, mirrored: orientation === 'mirrored' || orientation === 'upside-down-mirrored', margin });

  it('agrees when every clear reading has the predicted handedness, and says so per variant', () => {
    // each plane reflection reverses handedness (common practice): the templates' own counts decide
    const birdbath = getStackTemplate('birdbath').stack;
    const predicted = predictStack(birdbath).handedness;
    const asPredicted = predicted === 'mirrored' ? 'mirrored' : 'normal';
    const other = predicted === 'mirrored' ? 'normal' : 'mirrored';
    const rows = predictedAgainstMeasuredByVariant(birdbath, {}, [
      point({ captureSetId: 'a', orientation: seen(asPredicted) }),
      point({ captureSetId: 'b', orientation: seen(asPredicted, 0.3) }),
      point({ captureSetId: 'c', variant: 'fold mirror', orientation: seen(other) }),
      point({ captureSetId: 'd' }),
    ]);
    const base = rows.find((r) => r.variant === '')!;
    expect(base.handedness).toEqual({ predicted, measured: { sets: 2, mirrored: predicted === 'mirrored', turned: false }, agrees: true });
    const fold = rows.find((r) => r.variant === 'fold mirror')!;
    expect(fold.handedness.agrees).toBe(false);
  });

  it('leaves out unclear readings, reports a half turn, and calls disagreeing sets mixed', () => {
    expect(handednessCheck('kept', [point({ orientation: seen('mirrored', 0.05) })])).toEqual({ predicted: 'kept', measured: null, agrees: null });
    expect(handednessCheck('kept', [point({ orientation: seen('rotated-180') })])).toEqual({ predicted: 'kept', measured: { sets: 1, mirrored: false, turned: true }, agrees: true });
    const mixed = handednessCheck('mirrored', [point({ orientation: seen('mirrored') }), point({ orientation: seen('normal') })]);
    expect(mixed.measured?.mirrored).toBe('mixed');
    expect(mixed.agrees).toBe(false);
    expect(handednessCheck(null, [point({ orientation: seen('normal') })]).agrees).toBeNull();
  });
});
