import { describe, expect, it } from 'vitest';
import { compareVerdict, summarise, welchTest } from '../../../lib/stats';
import { compareGroups, decodeGroup, encodeGroup, orderComparisons, relativeChange } from '../../../lib/targets/compare';
import { METRIC_KEYS, type MetricKey } from '../../../lib/targets/metrics';
import { buildTrends, formatMeanCi, revisionStatistics, type SetReading } from '../../../lib/targets/series';

let seq = 0;
function reading(revisionId: string, acr: number | null, variant = ''): SetReading {
  const values = Object.fromEntries(METRIC_KEYS.map((k) => [k, null])) as Record<MetricKey, number | null>;
  values.ambientContrastRatio = acr;
  seq++;
  return { readingId: `r${seq}`, captureSetId: `c${seq}`, captureLabel: `#${seq}`, revisionId, variant, createdAt: new Date(seq * 1000), values };
}

describe('trends', () => {
  it('keep the revisions in order, empty ones included, with lib/stats summaries', () => {
    // invented readings
    const rs = [reading('b', 1.3), reading('b', 1.34), reading('b', 1.29), reading('a', 1.1)];
    const t = buildTrends(
      [
        { id: 'b', label: 'B', position: 2 },
        { id: 'c', label: 'C', position: 3 },
        { id: 'a', label: 'A', position: 1 },
      ],
      rs,
    ).ambientContrastRatio;
    expect(t.revisions.map((r) => r.label)).toEqual(['A', 'B', 'C']);
    const b = t.revisions[1];
    const s = summarise([1.3, 1.34, 1.29]);
    expect(b?.stats.mean).toBe(s.mean);
    expect(b?.stats.low).toBe(s.ci?.low);
    expect(b?.stats.high).toBe(s.ci?.high);
    expect(b?.points).toHaveLength(3);
    expect(t.revisions[0]?.stats).toMatchObject({ n: 1, mean: 1.1, low: null });
    expect(t.revisions[2]?.stats).toMatchObject({ n: 0, mean: null });
  });
});

describe('revision statistics', () => {
  it('give each metric over all capture sets, then per variant, from lib/stats; unmeasured metrics are named', () => {
    // invented: two variants of one revision
    const rs = [reading('x', 1.2, 'no polarizer'), reading('x', 1.26, 'no polarizer'), reading('x', 1.5, 'with polarizer'), reading('x', 1.56, 'with polarizer'), reading('x', 1.52, 'with polarizer')];
    const { rows, unmeasured } = revisionStatistics(rs);
    expect(rows.map((r) => r.variant)).toEqual([null, 'no polarizer', 'with polarizer']);
    expect(rows.every((r) => r.metric === 'ambientContrastRatio')).toBe(true);
    expect(unmeasured).toEqual(METRIC_KEYS.filter((k) => k !== 'ambientContrastRatio'));
    const all = summarise([1.2, 1.26, 1.5, 1.56, 1.52]);
    expect(rows[0]?.stats).toMatchObject({ n: 5, mean: all.mean, sd: all.sd, halfWidth: all.ci?.halfWidth });
    const w = summarise([1.5, 1.56, 1.52]);
    expect(rows[2]?.stats).toMatchObject({ n: 3, mean: w.mean, sd: w.sd });
    expect(formatMeanCi('ambientContrastRatio', rows[2]!.stats)).toBe(`${w.mean.toFixed(3)} ± ${w.ci!.halfWidth.toFixed(3)} : 1`);
    // one variant only: no per-variant rows
    expect(revisionStatistics(rs.slice(0, 2)).rows).toHaveLength(1);
    expect(revisionStatistics([]).rows).toEqual([]);
  });
});

describe('comparisons', () => {
  it('carry a group in the URL as the revision id with an optional variant', () => {
    const id = '0b8e1d0c-8f0a-4d3e-9a55-1c2b3d4e5f60';
    expect(decodeGroup(encodeGroup({ revisionId: id, variant: null }))).toEqual({ revisionId: id, variant: null });
    expect(decodeGroup(encodeGroup({ revisionId: id, variant: 'with polarizer' }))).toEqual({ revisionId: id, variant: 'with polarizer' });
    expect(decodeGroup(`${id}:`)).toEqual({ revisionId: id, variant: '' });
    expect(decodeGroup('not-an-id')).toBeNull();
    expect(decodeGroup(undefined)).toBeNull();
  });

  it('give B − A with Welch’s test from lib/stats and its plain-words verdict', () => {
    // invented: no polarizer vs with polarizer, five captures each
    const a = [1.21, 1.24, 1.22, 1.25, 1.23].map((v) => reading('x', v, 'no polarizer'));
    const b = [1.52, 1.55, 1.49, 1.56, 1.53].map((v) => reading('x', v, 'with polarizer'));
    const row = compareGroups({ label: 'VX-B · no polarizer', readings: a }, { label: 'VX-B · with polarizer', readings: b }).find((r) => r.metric === 'ambientContrastRatio');
    const w = welchTest(b.map((r) => r.values.ambientContrastRatio as number), a.map((r) => r.values.ambientContrastRatio as number));
    expect(row?.test?.difference).toBeCloseTo(w.difference, 12);
    expect(row?.test?.df).toBeCloseTo(w.df, 12);
    expect(row?.test?.p).toBe(w.p);
    expect(row?.level).toBe('unlikely-noise');
    expect(row?.verdict).toMatch(/^VX-B · with polarizer \(against VX-B · no polarizer\) raises the ambient contrast ratio by 0\.300 ± 0\.0\d\d; 5 vs 5 captures; unlikely to be noise, p < 0\.001\.$/);
    expect(row?.level).toBe(compareVerdict({ baseline: a.map((r) => r.values.ambientContrastRatio as number), variant: b.map((r) => r.values.ambientContrastRatio as number), subject: 'x', metric: 'y' }).level);
  });

  it('say it cannot tell below 3 captures, and name the side without data', () => {
    const rows = compareGroups({ label: 'A', readings: [reading('a', 1.2), reading('a', 1.3)] }, { label: 'B', readings: [reading('b', 1.4), reading('b', 1.5), reading('b', 1.45)] });
    const acr = rows.find((r) => r.metric === 'ambientContrastRatio');
    expect(acr?.level).toBe('too-few');
    expect(acr?.test).toBeNull();
    expect(acr?.verdict).toMatch(/^Too few captures to tell/);
    expect(rows.find((r) => r.metric === 'ghostRatio')?.level).toBe('no-data');
  });

  it('order by the size of the change or by p, with the rows lacking the figure last', () => {
    // invented: three metrics measured in both groups, the others in neither
    const set = (revisionId: string, acr: number, mich: number, ghost: number): SetReading => {
      const r = reading(revisionId, acr);
      r.values.michelson = mich;
      r.values.ghostRatio = ghost;
      return r;
    };
    const a = [set('a', 1.2, 0.5, 0.02), set('a', 1.22, 0.52, 0.021), set('a', 1.21, 0.49, 0.019)];
    const b = [set('b', 1.5, 0.51, 0.01), set('b', 1.48, 0.5, 0.011), set('b', 1.52, 0.53, 0.009)];
    const rows = compareGroups({ label: 'A', readings: a }, { label: 'B', readings: b });
    const acr = rows.find((r) => r.metric === 'ambientContrastRatio');
    // (B − A) / |A| from the means: 1.5 against 1.21
    expect(relativeChange(acr as NonNullable<typeof acr>)).toBeCloseTo((1.5 - 1.21) / 1.21, 12);
    expect(relativeChange(rows.find((r) => r.metric === 'uniformity') as (typeof rows)[number])).toBeNull();
    // ghost −50 %, contrast ratio +24 %, Michelson +2 %; the unmeasured metrics keep the catalogue's order after them
    const byChange = orderComparisons(rows, 'change').map((r) => r.metric);
    expect(byChange).toEqual(['ghostRatio', 'ambientContrastRatio', 'michelson', 'ansiContrast', 'uniformity', 'transmission', 'tintDeltaE00', 'transmissionOptics', 'veil', 'mtf50', 'mtf50PerDegree', 'displayDuv', 'colourUniformityDuv']);
    expect(orderComparisons(rows, 'change', true).map((r) => r.metric).slice(0, 3)).toEqual(['michelson', 'ambientContrastRatio', 'ghostRatio']);
    const byP = orderComparisons(rows, 'p');
    const ps = byP.flatMap((r) => (r.test ? [r.test.p] : []));
    expect(ps).toHaveLength(3);
    expect(ps).toEqual([...ps].sort((x, y) => x - y));
    expect(byP[0]?.metric).not.toBe('michelson');
    expect(byP.slice(3).every((r) => r.test === null)).toBe(true);
    expect(orderComparisons(byChange.map((k) => rows.find((r) => r.metric === k) as (typeof rows)[number]), 'metric').map((r) => r.metric)).toEqual(rows.map((r) => r.metric));
    expect(orderComparisons(rows, 'metric', true).map((r) => r.metric)).toEqual(rows.map((r) => r.metric).reverse());
  });
});
