import { describe, expect, it } from 'vitest';
import { gzipSync } from 'node:zlib';
import { METRIC_KEYS, type MetricKey } from '../../../lib/targets/metrics';
import { buildTrends, type RevisionRef, type SetReading, type Trend } from '../../../lib/targets/series';
import { fromTrendAnswer, sig, toTrendAnswer, type ExpandedTrend } from '../../../lib/targets/trend-answer';
import { seededRandom } from '../../fixtures/seeded-random';

// Invented readings; a seeded generator so a failure can be replayed.

function project(sets: number, revisions: number, seed = 3): { revs: RevisionRef[]; readings: SetReading[] } {
  const rnd = seededRandom(seed);
  const revs = Array.from({ length: revisions }, (_, i) => ({ id: `00000000-0000-4000-8000-${String(i).padStart(12, '0')}`, label: `R${i + 1}`, position: i + 1 }));
  const readings: SetReading[] = [];
  for (let k = 0; k < sets; k++) {
    const values = {} as Record<MetricKey, number | null>;
    for (const m of METRIC_KEYS) values[m] = rnd() < 0.1 ? null : 0.5 + rnd() * 20;
    const id = `${(rnd() * 2 ** 32).toString(16).padStart(8, '0')}-${k.toString(16).padStart(4, '0')}-4000-8000-${(rnd() * 2 ** 48).toString(16).padStart(12, '0').slice(0, 12)}`;
    readings.push({ readingId: `r${k}`, captureSetId: id, captureLabel: `set ${k}`, revisionId: revs[k % revisions]!.id, variant: k % 3 ? 'with polarizer' : '', createdAt: new Date(k * 1000), values });
  }
  return { revs, readings };
}

/** What the expanded trend looks like once its numbers carry 6 significant figures (and no set ids). */
function rounded(t: Trend): ExpandedTrend {
  const r = (v: number | null) => (v === null ? null : sig(v));
  return {
    metric: t.metric,
    revisions: t.revisions.map((rev) => ({
      ...rev,
      stats: { n: rev.stats.n, mean: r(rev.stats.mean), sd: r(rev.stats.sd), low: r(rev.stats.low), high: r(rev.stats.high), halfWidth: r(rev.stats.halfWidth) },
      points: rev.points.map((p) => ({ label: p.label, variant: p.variant, value: sig(p.value) })),
    })),
  };
}

describe('6 significant figures', () => {
  it('rounds half away from zero at the sixth figure and leaves zero and non-finite values alone', () => {
    // Number.prototype.toPrecision, ECMA-262 §21.1.3.5 (the values are worked by hand)
    expect(sig(1 / 3)).toBe(0.333333);
    expect(sig(2 / 3)).toBe(0.666667);
    expect(sig(123456789)).toBe(123457000);
    expect(sig(-0.000123456789)).toBe(-0.000123457);
    expect(sig(397.3)).toBe(397.3);
    expect(sig(0)).toBe(0);
    expect(sig(Number.POSITIVE_INFINITY)).toBe(Number.POSITIVE_INFINITY);
    expect(Math.abs(sig(Math.PI) - Math.PI) / Math.PI).toBeLessThan(5e-6);
  });
});

describe('trend answer', () => {
  it('expands back to the trend of every metric, to 6 significant figures', () => {
    const { revs, readings } = project(300, 7);
    const trends = buildTrends(revs, readings);
    const answer = JSON.parse(JSON.stringify(toTrendAnswer(revs, trends, [])));
    const back = fromTrendAnswer(answer);
    for (const m of METRIC_KEYS) expect(back[m]).toEqual(rounded(trends[m]));
  });

  it('names each capture set once, however many metrics it has a value in', () => {
    const { revs, readings } = project(300, 7);
    const answer = toTrendAnswer(revs, buildTrends(revs, readings), []);
    expect(answer.sets.length).toBe(300);
    // labels are unique in this project, so each set is there once
    expect(new Set(answer.sets.map((s) => s.label)).size).toBe(300);
    const one = toTrendAnswer(revs, { ambientContrastRatio: buildTrends(revs, readings).ambientContrastRatio }, []);
    const withValue = readings.filter((r) => r.values.ambientContrastRatio !== null).length;
    expect(one.sets.length).toBe(withValue);
    expect(Object.keys(one.trends)).toEqual(['ambientContrastRatio']);
  });

  it('keeps empty revisions and a project without readings', () => {
    const revs = [{ id: 'a', label: 'A', position: 1 }, { id: 'b', label: 'B', position: 2 }];
    const answer = toTrendAnswer(revs, buildTrends(revs, []), []);
    expect(answer.sets).toEqual([]);
    expect(answer.trends.transmission!.revisions).toEqual([
      { id: 'a', stats: { n: 0, mean: null, sd: null, low: null, high: null, halfWidth: null }, points: [] },
      { id: 'b', stats: { n: 0, mean: null, sd: null, low: null, high: null, halfWidth: null }, points: [] },
    ]);
  });

  it('is a fraction of the expanded shape for 2,000 capture sets, plain and gzipped', () => {
    const { revs, readings } = project(2000, 20);
    const trends = buildTrends(revs, readings);
    const expanded = Buffer.from(JSON.stringify({ revisions: revs, trends, targets: [] }));
    const compact = Buffer.from(JSON.stringify(toTrendAnswer(revs, trends, [])));
    expect(compact.length / expanded.length).toBeLessThan(0.25);
    expect(gzipSync(compact).length / gzipSync(expanded).length).toBeLessThan(0.3);
  });
});
