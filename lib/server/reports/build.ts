import { getComparisonGroup } from '../../../db/queries/comparisons';
import { listExportRows, type ExportRow } from '../../../db/queries/exports';
import { getRevision } from '../../../db/queries/revision-edits';
import { checkRevisionTargets, listTargets } from '../../../db/queries/targets';
import { getProjectTrend, listNewestReadings } from '../../../db/queries/trends';
import { getProjectName } from '../../../db/queries/projects';
import { notFound } from '../../errors';
import { formatLimit, formatMetricDifference, formatMetricMeanCi, formatMetricSpread, formatMetricValue, formatMetricWithU, formatTick, metricHeading, TABLE_METRICS } from '../../format';
import { compareGroups, formatChange, summariseComparison, testFigures, type GroupKey } from '../../targets/compare';
import { describeCondition } from '../../targets/conditions';
import { DEFAULTS_CAVEAT } from '../../targets/defaults';
import { comparatorWords, revisionVerdictText, STATUS_WORDS, type Target, type TargetCheck } from '../../targets/evaluate';
import { METRIC_KEYS, METRICS, type MetricKey } from '../../targets/metrics';
import { revisionStatistics, trendByVariant, variantLabel, type Trend } from '../../targets/series';
import { REPORT_CAUTIONS } from '../../reports/cautions';
import { ReportWriter, type ChartGroup, type ChartSpec } from '../../reports/pdf';
import { revisionFigures } from './figures';

export type ReportOptions = { labName: string; compress?: boolean; now?: Date };

const targetText = (t: Target) => `${METRICS[t.metric].label} ${comparatorWords(t.comparator)} ${formatLimit(t.metric, t.value)}`;
const conditionText = (t: Target) => [describeCondition(t.condition ?? {}), t.conditionNote].filter(Boolean).join(' · ') || 'any';

function writeTargets(w: ReportWriter, checks: TargetCheck[], scope: string): void {
  w.heading(`Targets on ${scope}`);
  if (checks.length === 0) {
    w.paragraph('No targets are set for this project.', { muted: true });
    return;
  }
  w.paragraph(`${scope} ${revisionVerdictText(checks)}.`);
  w.table(
    [
      { header: 'Variant', width: 2 },
      { header: 'Target', width: 3.6 },
      { header: 'Condition', width: 3.4 },
      { header: 'Mean (n)', width: 2.2, align: 'right' },
      { header: 'Status', width: 1.3 },
    ],
    checks.map((c) => ({
      cells: [
        c.variant === undefined ? 'all' : variantLabel(c.variant),
        `${targetText(c.target)}${c.target.isDefault ? ' (default)' : ''}`,
        conditionText(c.target),
        c.mean === null ? '—' : `${formatMetricValue(c.target.metric, c.mean)} (${c.n}${c.excluded ? `; ${c.excluded} left out` : ''})`,
        STATUS_WORDS[c.status].toUpperCase(),
      ],
      tone: [undefined, undefined, undefined, undefined, c.status === 'no-data' ? undefined : c.status],
    })),
  );
  w.paragraph('Each target is judged per variant, on the mean of the newest reading of every capture set whose stated conditions meet the target’s; the others are left out.', { muted: true, size: 8 });
  if (checks.some((c) => c.target.isDefault)) w.paragraph(DEFAULTS_CAVEAT, { muted: true, size: 8 });
}

function writeReadings(w: ReportWriter, rows: ExportRow[], withRevision: boolean): void {
  // the table's usual metrics, then any other that some reading here has (the optics' own transmission, MTF50, …)
  const keys: MetricKey[] = [...TABLE_METRICS, ...METRIC_KEYS.filter((k) => !TABLE_METRICS.includes(k) && k !== 'michelson' && k !== 'ansiContrast' && rows.some((r) => r[k] !== null))];
  const u = (r: ExportRow, k: MetricKey): number | undefined => (r.uncertainty as Partial<Record<string, number>>)[k];
  w.table(
    [...(withRevision ? [{ header: 'Revision', width: 1.6 }] : []), { header: 'Capture set', width: 3 }, { header: 'Variant', width: 2 }, ...keys.map((k) => ({ header: metricHeading(k), width: 1.7, align: 'right' as const }))],
    rows.map((r) => ({ cells: [...(withRevision ? [r.revisionLabel] : []), r.captureLabel, r.variant || '—', ...keys.map((k) => formatMetricWithU(k, r[k], u(r, k)))] })),
  );
}

function trendChart(trend: Trend, targets: Target[], highlight: string | null, checks: TargetCheck[]): ChartSpec {
  const { variants, stats } = trendByVariant(trend);
  // a revision with several variants gets one group per variant: the chart never draws a blend
  const groups: ChartGroup[] = trend.revisions.flatMap((r, i) => {
    const own = variants.map((v, j) => ({ v, s: stats[i]![j]! })).filter((x) => x.s.n > 0);
    if (own.length <= 1) return [{ label: own[0]?.v ? `${r.label} · ${own[0].v}` : r.label, mean: r.stats.mean, low: r.stats.low, high: r.stats.high, points: r.points.map((p) => p.value), highlight: r.id === highlight }];
    return own.map(({ v, s }) => ({ label: `${r.label} · ${variantLabel(v)}`, mean: s.mean, low: s.low, high: s.high, points: r.points.filter((p) => p.variant === v).map((p) => p.value), highlight: r.id === highlight }));
  });
  return {
    title: `${metricHeading(trend.metric)} across revisions`,
    unit: METRICS[trend.metric].unit === ': 1' ? 'contrast ratio, x : 1' : METRICS[trend.metric].unit,
    tick: (v) => formatTick(trend.metric, v),
    groups,
    targets: targets.filter((t) => t.metric === trend.metric).map((t) => ({ value: t.value, label: `target ${t.comparator === '>=' ? '≥' : '≤'} ${formatLimit(t.metric, t.value)}`, failing: checks.some((c) => c.target.id === t.id && c.status === 'fail') })),
  };
}

async function writeRevisionFigures(w: ReportWriter, labId: string, rows: ExportRow[]): Promise<void> {
  const { figures, missing, left } = await revisionFigures(labId, rows);
  w.heading('Photos and contrast maps');
  w.figures(figures, 2);
  const notes = [missing.length ? `Not shown: ${missing.join('; ')}.` : '', left ? `${left} more capture set${left === 1 ? '' : 's'} not shown here: each capture set’s own report has its photo and maps.` : ''].filter(Boolean);
  if (notes.length) w.paragraph(notes.join(' '), { muted: true, size: 8 });
}

/** The PDF of one revision: target status, statistics per metric, the trend chart, readings, cautions. */
export async function revisionReport(labId: string, revisionId: string, opts: ReportOptions): Promise<{ bytes: Buffer; name: string }> {
  const revision = await getRevision(labId, revisionId);
  if (!revision) throw notFound('No such revision');
  const [checks, trend, rows, targets, readings] = await Promise.all([
    checkRevisionTargets(labId, revision.projectId, revision.id),
    getProjectTrend(labId, revision.projectId),
    listExportRows(labId, { projectId: revision.projectId, revisionId: revision.id }),
    listTargets(labId, revision.projectId),
    listNewestReadings(labId, { projectId: revision.projectId, revisionId: revision.id }),
  ]);
  if (!trend) throw notFound('No such revision');
  const now = opts.now ?? new Date();
  const w = new ReportWriter(`${revision.projectName} ${revision.label}`, { compress: opts.compress });
  w.title(`${opts.labName} · revision report`, `${revision.projectName} · ${revision.label}`, `Revision #${revision.position}, ${revision.status}, built ${revision.builtOn ?? 'not yet'} · ${rows.length} analysed capture set${rows.length === 1 ? '' : 's'} · generated ${now.toISOString().slice(0, 16).replace('T', ' ')} UTC`);
  if (revision.notes) w.paragraph(revision.notes, { muted: true });
  writeTargets(w, checks, revision.label);
  w.heading(`Statistics of ${revision.label}`);
  // over all capture sets, then each variant on its own (the same rows as the revision page)
  const statistics = revisionStatistics(readings);
  w.table(
    [{ header: 'Metric', width: 3 }, { header: 'Captures', width: 2.2 }, { header: 'n', width: 0.7, align: 'right' }, { header: 'Mean ± 95% CI', width: 3, align: 'right' }, { header: 'SD', width: 1.6, align: 'right' }],
    statistics.rows.map((r) => ({
      cells: [metricHeading(r.metric), r.variant === null ? 'all' : variantLabel(r.variant), String(r.stats.n), formatMetricMeanCi(r.metric, r.stats), formatMetricSpread(r.metric, r.stats.sd)],
    })),
  );
  if (statistics.unmeasured.length) w.paragraph(`No readings yet of: ${statistics.unmeasured.map((k) => METRICS[k].label.toLowerCase()).join(', ')}.`, { muted: true, size: 8 });
  const charted = new Set<MetricKey>(['ambientContrastRatio', ...targets.map((t) => t.metric)]);
  for (const key of charted) w.chart(trendChart(trend.trends[key], targets, revision.id, checks));
  w.heading('Readings');
  if (rows.length) writeReadings(w, rows, false);
  else w.paragraph('No capture set of this revision has been analysed yet.', { muted: true });
  if (rows.length) await writeRevisionFigures(w, labId, rows);
  w.closingSection('Cautions', REPORT_CAUTIONS);
  const bytes = await w.finish(`Veilmeter · ${revision.projectName} · ${revision.label}`);
  return { bytes, name: `${revision.projectName}-${revision.label}-report` };
}

/** The PDF of a whole project: each revision's target status, the trend charts, readings, cautions. */
export async function projectReport(labId: string, projectId: string, opts: ReportOptions): Promise<{ bytes: Buffer; name: string }> {
  const project = await getProjectName(labId, projectId);
  if (!project) throw notFound('No such project');
  const [trend, targets, rows] = await Promise.all([getProjectTrend(labId, project.id), listTargets(labId, project.id), listExportRows(labId, { projectId: project.id })]);
  if (!trend) throw notFound('No such project');
  const now = opts.now ?? new Date();
  const w = new ReportWriter(`${project.name} trends`, { compress: opts.compress });
  w.title(`${opts.labName} · project report`, project.name, `${trend.revisions.length} revisions · ${rows.length} analysed capture sets · generated ${now.toISOString().slice(0, 16).replace('T', ' ')} UTC`);
  const latest = [...trend.revisions].reverse().find((r) => trend.trends.ambientContrastRatio.revisions.find((x) => x.id === r.id)?.points.length);
  let latestChecks: TargetCheck[] = [];
  for (const rev of trend.revisions) {
    const checks = await checkRevisionTargets(labId, project.id, rev.id);
    if (rev.id === latest?.id) latestChecks = checks;
    if (checks.some((c) => c.status !== 'no-data')) writeTargets(w, checks, rev.label);
  }
  if (targets.length === 0) writeTargets(w, [], project.name);
  const charted = new Set<MetricKey>(['ambientContrastRatio', ...targets.map((t) => t.metric)]);
  for (const key of charted) w.chart(trendChart(trend.trends[key], targets, latest?.id ?? null, latestChecks));
  w.heading('Readings');
  if (rows.length) writeReadings(w, rows, true);
  else w.paragraph('Nothing has been analysed in this project yet.', { muted: true });
  w.closingSection('Cautions', REPORT_CAUTIONS);
  const bytes = await w.finish(`Veilmeter · ${project.name}`);
  return { bytes, name: `${project.name}-report` };
}

/** The two sides of a comparison, or a 404 when either is not in this lab's project. */
export async function loadComparison(labId: string, projectId: string, a: GroupKey, b: GroupKey) {
  const [ga, gb] = await Promise.all([getComparisonGroup(labId, projectId, a), getComparisonGroup(labId, projectId, b)]);
  if (!ga || !gb) throw notFound('No such revision in this project');
  return { a: ga, b: gb, metrics: compareGroups(ga, gb) };
}

/** The PDF of a comparison: B against A per metric with CI, the change as a share of A, Welch t, df, p and the verdict. */
export async function comparisonReport(labId: string, projectId: string, a: GroupKey, b: GroupKey, opts: ReportOptions): Promise<{ bytes: Buffer; name: string }> {
  const project = await getProjectName(labId, projectId);
  if (!project) throw notFound('No such project');
  const cmp = await loadComparison(labId, project.id, a, b);
  const targets = await listTargets(labId, project.id);
  const now = opts.now ?? new Date();
  const w = new ReportWriter(`${project.name} comparison`, { compress: opts.compress });
  w.title(`${opts.labName} · comparison`, `${cmp.b.label} against ${cmp.a.label}`, `${project.name} · ${cmp.a.readings.length} vs ${cmp.b.readings.length} capture sets · generated ${now.toISOString().slice(0, 16).replace('T', ' ')} UTC`);
  w.heading('Per metric');
  w.table(
    [
      { header: 'Metric', width: 2.4 },
      { header: `A: ${cmp.a.label}`, width: 2.4, align: 'right' },
      { header: `B: ${cmp.b.label}`, width: 2.4, align: 'right' },
      { header: 'B − A ± 95% CI', width: 2.4, align: 'right' },
      { header: 'Change', width: 1.2, align: 'right' },
      { header: 't', width: 1, align: 'right' },
      { header: 'df', width: 1, align: 'right' },
      { header: 'p', width: 1.4, align: 'right' },
    ],
    cmp.metrics.map((c) => ({
      cells: [
        metricHeading(c.metric),
        `${formatMetricMeanCi(c.metric, c.a)} (n ${c.a.n})`,
        `${formatMetricMeanCi(c.metric, c.b)} (n ${c.b.n})`,
        c.test ? formatMetricDifference(c.metric, c.test.difference, c.test.ci.halfWidth) : '—',
        formatChange(c),
        ...testFigures(c),
      ],
    })),
  );
  w.heading('In plain words');
  w.paragraph(summariseComparison(cmp.a.label, cmp.b.label, cmp.metrics, targets).text);
  w.bullets(cmp.metrics.filter((c) => c.level !== 'no-data').map((c) => c.verdict));
  w.paragraph('Welch’s t test (unequal variances, Welch–Satterthwaite degrees of freedom), two-sided. Fewer than 3 captures in a group: too few to tell.', { muted: true, size: 8 });
  const charted = new Set<MetricKey>(['ambientContrastRatio', ...targets.map((t) => t.metric)]);
  for (const key of charted) {
    const m = METRICS[key];
    const c = cmp.metrics.find((x) => x.metric === key);
    if (!c) continue;
    w.chart({
      title: metricHeading(key),
      unit: m.unit === ': 1' ? 'contrast ratio, x : 1' : m.unit,
      tick: (v) => formatTick(key, v),
      groups: [
        { label: `A: ${cmp.a.label}`, mean: c.a.mean, low: c.a.low, high: c.a.high, points: cmp.a.readings.map((r) => r.values[key]).filter((v): v is number => v !== null) },
        { label: `B: ${cmp.b.label}`, mean: c.b.mean, low: c.b.low, high: c.b.high, points: cmp.b.readings.map((r) => r.values[key]).filter((v): v is number => v !== null) },
      ],
      targets: targets.filter((t) => t.metric === key).map((t) => ({ value: t.value, label: `target ${t.comparator === '>=' ? '≥' : '≤'} ${formatLimit(key, t.value)}` })),
    });
  }
  w.heading('Readings');
  const rows = await comparisonRows(labId, project.id, cmp.a, cmp.b);
  writeReadings(w, rows.map((r) => r.row), true);
  w.closingSection('Cautions', REPORT_CAUTIONS);
  const bytes = await w.finish(`Veilmeter · ${project.name} · comparison`);
  return { bytes, name: `${project.name}-${cmp.b.label}-vs-${cmp.a.label}` };
}

/** Export rows of both sides, each tagged A or B with its label. */
export async function comparisonRows(labId: string, projectId: string, a: GroupKey & { label: string }, b: GroupKey & { label: string }): Promise<{ group: string; row: ExportRow }[]> {
  const [ra, rb] = await Promise.all([
    listExportRows(labId, { projectId, revisionId: a.revisionId, variant: a.variant }),
    listExportRows(labId, { projectId, revisionId: b.revisionId, variant: b.variant }),
  ]);
  return [...ra.map((row) => ({ group: `A: ${a.label}`, row })), ...rb.map((row) => ({ group: `B: ${b.label}`, row }))];
}
