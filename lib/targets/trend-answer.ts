import type { MetricKey } from './metrics';
import type { GroupStats, RevisionRef, Trend } from './series';

/**
 * The trend as the API sends it: what a chart draws. Each capture set is named once in `sets`
 * (label and variant); a point is then `[index into sets, value]`, and values and statistics carry
 * 6 significant figures. The readings list is the per-capture view, with ids and full precision,
 * as is the CSV export. Leaving the ids out keeps the answer small: at 2,000 capture sets their
 * random digits would be most of its compressed bytes.
 */
export type TrendSet = { label: string; variant: string };
export type TrendAnswerPoint = { label: string; variant: string; value: number };
export type ExpandedTrend = { metric: MetricKey; revisions: (RevisionRef & { stats: GroupStats; points: TrendAnswerPoint[] })[] };
export type TrendAnswerRevision = { id: string; stats: GroupStats; points: [number, number][] };
export type TrendAnswer<T = unknown> = {
  revisions: RevisionRef[];
  sets: TrendSet[];
  trends: Partial<Record<MetricKey, { metric: MetricKey; revisions: TrendAnswerRevision[] }>>;
  targets: T[];
};

export const ANSWER_DIGITS = 6;

/** A number to 6 significant figures (as a number, so JSON prints its shortest form). */
export function sig(v: number): number {
  return Number.isFinite(v) && v !== 0 ? Number(v.toPrecision(ANSWER_DIGITS)) : v;
}
const sigOrNull = (v: number | null): number | null => (v === null ? null : sig(v));

function roundStats(s: GroupStats): GroupStats {
  return { n: s.n, mean: sigOrNull(s.mean), sd: sigOrNull(s.sd), low: sigOrNull(s.low), high: sigOrNull(s.high), halfWidth: sigOrNull(s.halfWidth) };
}

/** The answer for the given trends (all metrics, or the one asked for) and their targets. */
export function toTrendAnswer<T>(revisions: RevisionRef[], trends: Partial<Record<MetricKey, Trend>>, targets: T[]): TrendAnswer<T> {
  const sets: TrendSet[] = [];
  const index = new Map<string, number>();
  const out: TrendAnswer<T>['trends'] = {};
  for (const [metric, trend] of Object.entries(trends) as [MetricKey, Trend][]) {
    out[metric] = {
      metric,
      revisions: trend.revisions.map((rev) => ({
        id: rev.id,
        stats: roundStats(rev.stats),
        points: rev.points.map((p): [number, number] => {
          let k = index.get(p.captureSetId);
          if (k === undefined) {
            k = sets.push({ label: p.label, variant: p.variant }) - 1;
            index.set(p.captureSetId, k);
          }
          return [k, sig(p.value)];
        }),
      })),
    };
  }
  return { revisions, sets, trends: out, targets };
}

/** The answer expanded back into one trend per metric (what a chart or a script works with). */
export function fromTrendAnswer(answer: TrendAnswer): Partial<Record<MetricKey, ExpandedTrend>> {
  const refs = new Map(answer.revisions.map((r) => [r.id, r]));
  const out: Partial<Record<MetricKey, ExpandedTrend>> = {};
  for (const [metric, t] of Object.entries(answer.trends) as [MetricKey, { revisions: TrendAnswerRevision[] }][]) {
    out[metric] = {
      metric,
      revisions: t.revisions.map((rev) => {
        const ref = refs.get(rev.id);
        return {
          id: rev.id,
          label: ref?.label ?? '',
          position: ref?.position ?? 0,
          stats: rev.stats,
          points: rev.points.map(([k, value]) => {
            const s = answer.sets[k]!;
            return { label: s.label, variant: s.variant, value };
          }),
        };
      }),
    };
  }
  return out;
}
