import { uuidSchema } from '../schemas/common';
import { formatMetricDifference, formatRelativeChange, formatStatistic } from '../format';
import { compareVerdict, formatPValue, levelFromP, type TwoSampleResult, type VerdictLevel } from '../stats';
import { METRIC_LIST, METRICS, type MetricKey } from './metrics';
import { groupStats, values, type GroupStats, type SetReading } from './series';

/** A revision, optionally narrowed to one variant ('' is the captures without a variant label). */
export type GroupKey = { revisionId: string; variant: string | null };

/** URL form: "<revisionId>" for the whole revision, "<revisionId>:<variant>" for one variant. */
export function encodeGroup(g: GroupKey): string {
  return g.variant === null ? g.revisionId : `${g.revisionId}:${g.variant}`;
}

/** Null for anything that is not a revision id with an optional variant. */
export function decodeGroup(s: string | null | undefined): GroupKey | null {
  if (!s) return null;
  const i = s.indexOf(':');
  const revisionId = i < 0 ? s : s.slice(0, i);
  if (!uuidSchema.safeParse(revisionId).success) return null;
  const variant = i < 0 ? null : s.slice(i + 1);
  if (variant !== null && variant.length > 80) return null;
  return { revisionId: revisionId.toLowerCase(), variant };
}

export function groupLabel(revisionLabel: string, variant: string | null): string {
  if (variant === null) return revisionLabel;
  return `${revisionLabel} · ${variant || 'no variant label'}`;
}

export type MetricComparison = {
  metric: MetricKey;
  a: GroupStats;
  b: GroupStats;
  /** Welch test of B − A; null below 3 captures in either group or without scatter data. */
  test: TwoSampleResult | null;
  level: VerdictLevel | 'no-data';
  verdict: string;
};

const LEVEL_WORDS: Record<Exclude<VerdictLevel, 'too-few'>, string> = {
  'unlikely-noise': 'unlikely to be noise',
  'probably-real': 'probably real, though more captures would firm it up',
  'could-be-noise': 'could be noise',
};

/** "raises the see-through transmission by 31.0 ± 2.9 percentage points" (figures from lib/format). */
export function changeWords(metric: MetricKey, t: Pick<TwoSampleResult, 'difference' | 'ci'>): string {
  const size = formatMetricDifference(metric, t.difference, t.ci.halfWidth, { signed: false, long: true });
  const zero = /^0(\.0*)?( |$)/.test(size.replace(/ ±.*$/, ' '));
  if (zero) return `leaves ${METRICS[metric].phrase} unchanged (${formatMetricDifference(metric, t.difference, t.ci.halfWidth, { long: true })})`;
  return `${t.difference > 0 ? 'raises' : 'lowers'} ${METRICS[metric].phrase} by ${size}`;
}

/** Every metric of group B against group A (the baseline), with the plain-words verdict. */
export function compareGroups(a: { label: string; readings: readonly SetReading[] }, b: { label: string; readings: readonly SetReading[] }): MetricComparison[] {
  return METRIC_LIST.map((m) => {
    const va = values(a.readings, m.key);
    const vb = values(b.readings, m.key);
    const sa = groupStats(va);
    const sb = groupStats(vb);
    if (va.length === 0 || vb.length === 0) {
      return { metric: m.key, a: sa, b: sb, test: null, level: 'no-data', verdict: `No ${m.label.toLowerCase()} readings in ${va.length === 0 ? a.label : b.label}.` };
    }
    const subject = `${b.label} (against ${a.label})`;
    const v = compareVerdict({ baseline: va, variant: vb, subject, metric: m.phrase, minPerGroup: 3 });
    if (!v.comparison) return { metric: m.key, a: sa, b: sb, test: null, level: v.level, verdict: v.text };
    const c = v.comparison;
    const counts = `${vb.length} vs ${va.length} capture${vb.length === 1 && va.length === 1 ? '' : 's'}`;
    const level = levelFromP(c.p);
    const text = `${subject.charAt(0).toUpperCase()}${subject.slice(1)} ${changeWords(m.key, c)}; ${counts}; ${LEVEL_WORDS[level]}, ${formatPValue(c.p)}.`;
    return { metric: m.key, a: sa, b: sb, test: c, level, verdict: text };
  });
}

/** Which way is good for a metric: the team's target on it decides, else the metric's own direction. */
export function goodDirection(metric: MetricKey, targets: readonly { metric: MetricKey; comparator: '>=' | '<=' }[] = []): 'higher' | 'lower' {
  const t = targets.find((x) => x.metric === metric);
  if (t) return t.comparator === '>=' ? 'higher' : 'lower';
  return METRICS[metric].better;
}

/** Whether a change is good, bad or not shown to be a change (p ≥ 0.05, too few captures, no data). */
export type ChangeTone = 'good' | 'bad' | 'unclear';

/** A change's tone for the team: moved (p < 0.05) and in the good direction, moved the wrong way, or unclear. */
export function changeTone(r: Pick<MetricComparison, 'metric' | 'test' | 'level'>, targets: readonly { metric: MetricKey; comparator: '>=' | '<=' }[] = []): ChangeTone {
  if (!r.test || (r.level !== 'unlikely-noise' && r.level !== 'probably-real')) return 'unclear';
  const up = r.test.difference > 0;
  return (goodDirection(r.metric, targets) === 'higher') === up ? 'good' : 'bad';
}

export type ComparisonSummary = { text: string; gains: MetricKey[]; losses: MetricKey[]; unclear: MetricKey[] };

/**
 * The plain-language summary: every metric that moved (p < 0.05), gains and losses together, then
 * the metrics that did not clearly move. "VX-B · with polarizer, against VX-B · no polarizer:
 * raises the ambient contrast ratio by 5.05 ± 0.29 and lowers the see-through transmission by
 * 31 ± 3 percentage points."
 */
export function summariseComparison(aLabel: string, bLabel: string, rows: readonly MetricComparison[], targets: readonly { metric: MetricKey; comparator: '>=' | '<=' }[] = []): ComparisonSummary {
  const gains: MetricComparison[] = [];
  const losses: MetricComparison[] = [];
  const unclear: MetricKey[] = [];
  for (const r of rows) {
    if (r.level === 'no-data') continue;
    const tone = changeTone(r, targets);
    if (tone === 'good') gains.push(r);
    else if (tone === 'bad') losses.push(r);
    else unclear.push(r.metric);
  }
  const list = (xs: string[]) => (xs.length <= 1 ? (xs[0] ?? '') : `${xs.slice(0, -1).join(', ')} and ${xs[xs.length - 1]}`);
  const words = (r: MetricComparison) => (r.test ? `${changeWords(r.metric, r.test)} (${formatPValue(r.test.p)})` : '');
  const parts: string[] = [];
  if (gains.length) parts.push(`Gains: ${list(gains.map(words))}.`);
  if (losses.length) parts.push(`Losses: ${list(losses.map(words))}.`);
  if (!gains.length && !losses.length) parts.push('No metric moved clearly (p < 0.05).');
  if (unclear.length) parts.push(`Not clearly changed: ${list(unclear.map((k) => METRICS[k].phrase.replace(/^the /, '')))}.`);
  return { text: `${bLabel} against ${aLabel}. ${parts.join(' ')}`, gains: gains.map((r) => r.metric), losses: losses.map((r) => r.metric), unclear };
}

/** B's mean against A's as a share of A's ((B − A) / |A|); null without both means or when A's is 0. */
export function relativeChange(r: Pick<MetricComparison, 'a' | 'b'>): number | null {
  const a = r.a.mean;
  const b = r.b.mean;
  if (a === null || b === null || a === 0 || !Number.isFinite(a) || !Number.isFinite(b)) return null;
  return (b - a) / Math.abs(a);
}

/** The relative change as shown: "+32.9 %", "−4.0 %", "+120 %", or "—" without one. */
export function formatChange(r: Pick<MetricComparison, 'a' | 'b'>): string {
  return formatRelativeChange(relativeChange(r));
}

/** Welch t, df and p as the table and the PDF show them ("—" each without a test; p without its "p ="). */
export function testFigures(r: Pick<MetricComparison, 'test'>): [t: string, df: string, p: string] {
  const t = r.test;
  if (!t) return ['—', '—', '—'];
  return [formatStatistic(t.t, 2), formatStatistic(t.df, 1), formatPValue(t.p).replace(/^p = /, '').replace(/^p < /, '< ')];
}

/** How the comparison table can be ordered: the catalogue's order, the size of the change, or the p value. */
export type ComparisonOrder = 'metric' | 'change' | 'p';

/**
 * Rows ordered for the table. `change` puts the largest |relative change| first and `p` the
 * smallest p first (reversed when `reverse`); rows without the figure always go last, and ties
 * keep the catalogue's order.
 */
export function orderComparisons(rows: readonly MetricComparison[], order: ComparisonOrder, reverse = false): MetricComparison[] {
  const key = (r: MetricComparison): number | null => {
    if (order === 'change') {
      const c = relativeChange(r);
      return c === null ? null : -Math.abs(c);
    }
    if (order === 'p') return r.test && Number.isFinite(r.test.p) ? r.test.p : null;
    return null;
  };
  const position = new Map(METRIC_LIST.map((m, i) => [m.key, i]));
  const catalogue = (x: MetricComparison, y: MetricComparison): number => (position.get(x.metric) ?? 0) - (position.get(y.metric) ?? 0);
  return [...rows].sort((x, y) => {
    if (order === 'metric') return reverse ? catalogue(y, x) : catalogue(x, y);
    const kx = key(x);
    const ky = key(y);
    if (kx === null || ky === null) return kx === ky ? catalogue(x, y) : kx === null ? 1 : -1;
    const d = reverse ? ky - kx : kx - ky;
    return d !== 0 ? d : catalogue(x, y);
  });
}
