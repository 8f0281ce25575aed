import { describe, expect, it } from 'vitest';
import { describeCondition, meetsCondition, toCondition } from '../../../lib/targets/conditions';
import { checkTargetsOn, revisionVerdictText, verdictsByVariant, type Target } from '../../../lib/targets/evaluate';
import { METRIC_KEYS, type MetricKey } from '../../../lib/targets/metrics';
import type { SetReading } from '../../../lib/targets/series';

// Every value here is invented.
let seq = 0;
function reading(variant: string, acr: number, conditions: SetReading['conditions'] = { pattern: 'full', ambientLux: 500, backgroundCdm2: 1500 }, transmission: number | null = null): SetReading {
  const values = Object.fromEntries(METRIC_KEYS.map((k) => [k, null])) as Record<MetricKey, number | null>;
  values.ambientContrastRatio = acr;
  values.transmission = transmission;
  seq++;
  return { readingId: `r${seq}`, captureSetId: `c${seq}`, captureLabel: `#${seq}`, revisionId: 'rev', variant, createdAt: new Date(seq * 1000), values, conditions };
}
const target = (over: Partial<Target> = {}): Target => ({ id: 't1', projectId: 'p', metric: 'ambientContrastRatio', comparator: '>=', value: 2.5, conditionNote: '', isDefault: false, ...over });

describe('targets judged per variant', () => {
  // the blend of the two variants (2.655) would pass 2.5; each variant on its own does not both pass
  const readings = [2.25, 2.3, 2.29].map((v) => reading('no polarizer', v)).concat([3.0, 3.05, 3.04].map((v) => reading('with polarizer', v)));

  it('never judge a blend: one check per variant, each on its own readings', () => {
    const checks = checkTargetsOn([target()], readings);
    expect(checks.map((c) => [c.variant, c.status, c.n])).toEqual([
      ['no polarizer', 'fail', 3],
      ['with polarizer', 'pass', 3],
    ]);
    expect(checks[0]!.mean).toBeCloseTo((2.25 + 2.3 + 2.29) / 3, 12);
  });

  it('say which variants pass: a revision passes only as the variants that meet every target', () => {
    const checks = checkTargetsOn([target(), target({ id: 't2', metric: 'transmission', comparator: '>=', value: 0.3 })], readings);
    expect(verdictsByVariant(checks).map((v) => [v.variant, v.passes])).toEqual([
      ['no polarizer', false],
      ['with polarizer', true],
    ]);
    expect(revisionVerdictText(checks)).toBe('fails 1 of 1 target (1 without readings) as “no polarizer”; meets its target (1 without readings) as “with polarizer”');
  });

  it('judge a target that names variants only on those, and show a named variant without readings as no data', () => {
    const checks = checkTargetsOn([target({ variants: ['with polarizer', 'with visor'] })], readings);
    expect(checks.map((c) => [c.variant, c.status])).toEqual([
      ['with polarizer', 'pass'],
      ['with visor', 'no-data'],
    ]);
  });

  it('keep the old wording for a revision without variant labels', () => {
    const checks = checkTargetsOn([target()], [reading('', 2.6), reading('', 2.7)]);
    expect(checks).toHaveLength(1);
    expect(revisionVerdictText(checks)).toBe('meets its target');
  });
});

describe('structured conditions', () => {
  it('judge only the capture sets whose stated conditions meet the target’s, and count the rest', () => {
    const rs = [
      reading('', 3.0, { pattern: 'full', ambientLux: 450, backgroundCdm2: 1200 }),
      reading('', 1.0, { pattern: 'full', ambientLux: 5000, backgroundCdm2: 1200 }), // window light: out of range
      reading('', 1.1, { pattern: 'full', ambientLux: null, backgroundCdm2: 1200 }), // not stated
      reading('', 1.2, { pattern: 'checkerboard', ambientLux: 500, backgroundCdm2: 1200 }),
    ];
    const [c] = checkTargetsOn([target({ condition: { ambientLuxMin: 300, ambientLuxMax: 700, pattern: 'full' } })], rs);
    expect(c).toMatchObject({ status: 'pass', n: 1, mean: 3.0, excluded: 3 });
    expect(c!.excludedWhy).toEqual(['ambient 5,000 lx', 'ambient illuminance not stated', 'checkerboard pattern']);
  });

  it('treat the bounds as inclusive and an empty condition as met by anything', () => {
    expect(meetsCondition({ backgroundCdm2Min: 1000, backgroundCdm2Max: 2000 }, { pattern: 'full', ambientLux: null, backgroundCdm2: 2000 })).toEqual({ ok: true });
    expect(meetsCondition({ backgroundCdm2Min: 1000 }, { pattern: 'full', ambientLux: null, backgroundCdm2: 999 })).toMatchObject({ ok: false });
    expect(meetsCondition({}, undefined)).toEqual({ ok: true });
    expect(meetsCondition({ pattern: 'full' }, undefined)).toMatchObject({ ok: false, why: 'conditions not stated' });
  });

  it('read stored JSON defensively and describe it in words', () => {
    expect(toCondition({ ambientLuxMin: 300, ambientLuxMax: 'x', pattern: 'stripes', extra: 1 })).toEqual({ ambientLuxMin: 300 });
    expect(describeCondition({ ambientLuxMin: 300, ambientLuxMax: 700, pattern: 'full' })).toBe('ambient 300–700 lx · full-white pattern');
    expect(describeCondition({ backgroundCdm2Min: 30000 })).toBe('background at least 30,000 cd/m²');
    expect(describeCondition({})).toBe('');
  });
});

describe('trend per variant', () => {
  it('gives each variant its own statistics per revision, never the blend', async () => {
    const { buildTrends, trendByVariant } = await import('../../../lib/targets/series');
    const rs = [reading('no polarizer', 2.2), reading('no polarizer', 2.4), reading('with polarizer', 3.0), reading('with polarizer', 3.2)];
    const trends = buildTrends([{ id: 'rev', label: 'VX-B', position: 1 }], rs);
    const t = trendByVariant(trends.ambientContrastRatio);
    expect(t.variants).toEqual(['no polarizer', 'with polarizer']);
    expect(t.stats[0]!.map((s) => s.mean)).toEqual([2.3, 3.1]);
    expect(trends.ambientContrastRatio.revisions[0]!.stats.mean).toBeCloseTo(2.7, 12); // the blend the chart no longer draws
  });
});
