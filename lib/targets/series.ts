import { summarise } from '../stats';
import { formatMetricMeanCi } from '../format/metrics';
import type { StatedConditions } from './conditions';
import { METRIC_KEYS, type MetricKey } from './metrics';

/** The newest reading of one capture set, reduced to what trends, comparisons and targets need. */
export type SetReading = {
  readingId: string;
  captureSetId: string;
  captureLabel: string;
  revisionId: string;
  variant: string;
  createdAt: Date;
  values: Record<MetricKey, number | null>;
  /** Standard uncertainty of each value that has one (readings of engine 1.2.0 on). */
  uncertainty?: Partial<Record<string, number>>;
  /** What the capture set states about its shot (targets judge only the sets that meet their condition). */
  conditions?: StatedConditions;
};

export type RevisionRef = { id: string; label: string; position: number };

export type GroupStats = {
  n: number;
  mean: number | null;
  sd: number | null;
  /** 95% CI of the mean with Student's t; null below two values. */
  low: number | null;
  high: number | null;
  halfWidth: number | null;
};

export type TrendPoint = { captureSetId: string; label: string; variant: string; value: number; /** its standard uncertainty, when the reading has one */ u?: number };

export type TrendRevision = RevisionRef & { stats: GroupStats; points: TrendPoint[] };

export type Trend = { metric: MetricKey; revisions: TrendRevision[] };

export function values(readings: readonly SetReading[], metric: MetricKey): number[] {
  const out: number[] = [];
  for (const r of readings) {
    const v = r.values[metric];
    if (v !== null && Number.isFinite(v)) out.push(v);
  }
  return out;
}

/** n, mean, SD and the 95% CI from lib/stats; an empty group has only n = 0. */
export function groupStats(vals: readonly number[]): GroupStats {
  if (vals.length === 0) return { n: 0, mean: null, sd: null, low: null, high: null, halfWidth: null };
  const s = summarise(vals);
  return { n: s.n, mean: s.mean, sd: s.sd, low: s.ci?.low ?? null, high: s.ci?.high ?? null, halfWidth: s.ci?.halfWidth ?? null };
}

/** One trend per metric across the revisions in their order; revisions without readings stay, empty. */
export function buildTrends(revisions: readonly RevisionRef[], readings: readonly SetReading[]): Record<MetricKey, Trend> {
  const ordered = [...revisions].sort((a, b) => a.position - b.position || a.label.localeCompare(b.label));
  const byRevision = new Map<string, SetReading[]>();
  for (const r of readings) {
    const list = byRevision.get(r.revisionId);
    if (list) list.push(r);
    else byRevision.set(r.revisionId, [r]);
  }
  const out = {} as Record<MetricKey, Trend>;
  for (const metric of METRIC_KEYS) {
    out[metric] = {
      metric,
      revisions: ordered.map((rev) => {
        const rs = byRevision.get(rev.id) ?? [];
        const points: TrendPoint[] = [];
        for (const r of rs) {
          const v = r.values[metric];
          if (v !== null && Number.isFinite(v)) {
            const u = r.uncertainty?.[metric];
            points.push(typeof u === 'number' && Number.isFinite(u) ? { captureSetId: r.captureSetId, label: r.captureLabel, variant: r.variant, value: v, u } : { captureSetId: r.captureSetId, label: r.captureLabel, variant: r.variant, value: v });
          }
        }
        return { id: rev.id, label: rev.label, position: rev.position, stats: groupStats(points.map((p) => p.value)), points };
      }),
    };
  }
  return out;
}

/** Mean ± 95% CI half-width with the unit, digits from the interval ("—" for an empty group, the mean alone for n = 1). */
export function formatMeanCi(key: MetricKey, s: GroupStats, withUnit = true): string {
  return formatMetricMeanCi(key, s, { unit: withUnit });
}

/** One row of a revision's statistics: a metric over all its capture sets, or over one variant's. */
export type RevisionStatRow = { metric: MetricKey; variant: string | null; stats: GroupStats };

/**
 * Per metric, n, mean, SD and 95% CI over the revision's capture sets (each counted once, with its
 * newest reading), then over each variant when there is more than one. Metrics without a single
 * reading are left out; the caller names them.
 */
export function revisionStatistics(readings: readonly SetReading[]): { rows: RevisionStatRow[]; unmeasured: MetricKey[] } {
  const variants = [...new Set(readings.map((r) => r.variant))].sort((a, b) => a.localeCompare(b));
  const rows: RevisionStatRow[] = [];
  const unmeasured: MetricKey[] = [];
  for (const key of METRIC_KEYS) {
    const all = values(readings, key);
    if (all.length === 0) {
      unmeasured.push(key);
      continue;
    }
    rows.push({ metric: key, variant: null, stats: groupStats(all) });
    if (variants.length > 1) {
      for (const v of variants) rows.push({ metric: key, variant: v, stats: groupStats(values(readings.filter((r) => r.variant === v), key)) });
    }
  }
  return { rows, unmeasured };
}

/** The variants a trend's captures carry, sorted, the unlabelled ('') first. */
export function trendVariants(trend: Pick<Trend, 'revisions'>): string[] {
  const set = new Set<string>();
  for (const r of trend.revisions) for (const p of r.points) set.add(p.variant);
  return [...set].sort((a, b) => (a === '' ? -1 : b === '' ? 1 : a.localeCompare(b)));
}

/**
 * One line per variant: for each revision (in the trend's order) the statistics of that variant's
 * captures alone, never blended with another variant's. `stats[i][j]` is revision i, variant j.
 */
export function trendByVariant(trend: Pick<Trend, 'revisions'>): { variants: string[]; stats: GroupStats[][] } {
  const variants = trendVariants(trend);
  const stats = trend.revisions.map((r) => variants.map((v) => groupStats(r.points.filter((p) => p.variant === v).map((p) => p.value))));
  return { variants, stats };
}

/**
 * Colours told apart with the common forms of colour blindness (Okabe & Ito, "Color Universal
 * Design", 2008), one per variant in the order of `trendVariants`.
 */
export const VARIANT_COLOURS = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#56B4E9', '#D55E00', '#999999'] as const;

export function variantColour(index: number): string {
  return VARIANT_COLOURS[index % VARIANT_COLOURS.length]!;
}

export function variantLabel(v: string): string {
  return v || 'no variant label';
}
