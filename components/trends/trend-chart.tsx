'use client';

import { useRouter } from 'next/navigation';
import { useMemo, useState } from 'react';
import { Area, CartesianGrid, ComposedChart, ErrorBar, Line, ReferenceLine, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import { formatLimit, formatMetricMeanCi, formatMetricWithU, formatTick, metricHeading } from '@/lib/format';
import { comparatorWords, type Target } from '@/lib/targets/evaluate';
import { METRIC_LIST, type MetricKey } from '@/lib/targets/metrics';
import { trendByVariant, variantColour, variantLabel, type GroupStats, type Trend } from '@/lib/targets/series';

type SeriesCell = { mean: number | null; band: [number, number] | null; ci: [number, number] | null; stats: GroupStats };
type MeanRow = { x: number; id: string; label: string; series: SeriesCell[] } & Record<string, unknown>;
type PointRow = { x: number; y: number; u?: number; capture: string; variant: string; revision: string; colour: string };

// Spreads a revision's captures a little sideways so equal values do not hide each other.
function jitter(i: number, n: number): number {
  if (n <= 1) return 0;
  return ((i / (n - 1)) * 2 - 1) * Math.min(0.18, 0.03 * n);
}

function MeanDot(props: { cx?: number; cy?: number; payload?: MeanRow; onOpen: (id: string) => void; colour: string; variant: string; j: number }) {
  const { cx, cy, payload, onOpen, colour, variant, j } = props;
  if (cx === undefined || cy === undefined || !payload || payload.series[j]?.mean == null) return <g />;
  return (
    <g
      className="vm-trend-mean"
      data-testid="trend-mean"
      data-variant={variant}
      role="link"
      tabIndex={0}
      aria-label={`Open revision ${payload.label}${variant ? ` (${variant})` : ''}`}
      style={{ cursor: 'pointer' }}
      onClick={() => onOpen(payload.id)}
      onKeyDown={(e) => {
        if (e.key === 'Enter') onOpen(payload.id);
      }}
    >
      <circle cx={cx} cy={cy} r={6} fill={colour} stroke="rgb(var(--canvas))" strokeWidth={2} />
    </g>
  );
}

function PointDot(props: unknown) {
  const { cx, cy, payload } = props as { cx?: number; cy?: number; payload?: PointRow };
  if (cx === undefined || cy === undefined || !payload) return <g />;
  return <circle className="vm-trend-point" data-testid="trend-point" data-variant={payload.variant} cx={cx} cy={cy} r={3.5} fill={payload.colour} fillOpacity={0.7} />;
}

const isPoint = (r: MeanRow | PointRow): r is PointRow => typeof (r as PointRow).capture === 'string' && !('series' in r);

function TrendTooltip({ active, payload, metric, variants, colours }: { active?: boolean; payload?: { payload?: MeanRow | PointRow }[]; metric: MetricKey; variants: string[]; colours: string[] }) {
  const row = active ? payload?.[0]?.payload : undefined;
  if (!row) return null;
  const box = 'rounded-md border border-line bg-panel px-3 py-2 text-xs text-ink shadow-lg';
  if (isPoint(row)) {
    return (
      <div className={box}>
        <p className="font-semibold">{row.capture}</p>
        <p className="text-muted">
          {row.revision}
          {row.variant ? ` · ${row.variant}` : ''}
        </p>
        <p className="font-mono">{formatMetricWithU(metric, row.y, row.u)}</p>
      </div>
    );
  }
  const shown = row.series.map((c, j) => ({ c, j })).filter(({ c }) => c.stats.n > 0);
  return (
    <div className={box}>
      <p className="font-semibold">{row.label}</p>
      {shown.length === 0 ? <p className="text-muted">no readings</p> : null}
      {shown.map(({ c, j }) => (
        <p key={j} className="font-mono">
          {variants.length > 1 ? (
            <span className="mr-1 font-sans" style={{ color: colours[j] }}>
              {variantLabel(variants[j] ?? '')}:
            </span>
          ) : null}
          mean {formatMetricMeanCi(metric, c.stats)} <span className="font-sans text-muted">(n {c.stats.n})</span>
        </p>
      ))}
      {shown.length ? <p className="text-muted">95% CI · click a mean to open</p> : null}
    </div>
  );
}

export function TrendChart({ projectId, trends, targets, initialMetric }: { projectId: string; trends: Record<MetricKey, Trend>; targets: Target[]; initialMetric?: MetricKey }) {
  const router = useRouter();
  const withData = METRIC_LIST.filter((m) => trends[m.key].revisions.some((r) => r.points.length > 0));
  const [metric, setMetric] = useState<MetricKey>(initialMetric ?? withData[0]?.key ?? 'ambientContrastRatio');
  const trend = trends[metric];
  const metricTargets = targets.filter((t) => t.metric === metric);

  const { means, points, domain, ticks, variants, colours } = useMemo(() => {
    const { variants, stats } = trendByVariant(trend);
    // one variant keeps the theme's own colour; several get colours told apart by colour-blind readers
    const colours = variants.length > 1 ? variants.map((_, j) => variantColour(j)) : ['rgb(var(--beam))'];
    const means: MeanRow[] = trend.revisions.map((r, i) => {
      const series: SeriesCell[] = (stats[i] ?? []).map((st) => ({
        mean: st.mean,
        band: st.low !== null && st.high !== null ? [st.low, st.high] : null,
        // the same interval as whiskers on the mean: it still shows where a revision stands alone
        ci: st.mean !== null && st.low !== null && st.high !== null ? [st.mean - st.low, st.high - st.mean] : null,
        stats: st,
      }));
      const row: MeanRow = { x: i, id: r.id, label: r.label, series };
      series.forEach((c, j) => {
        row[`mean${j}`] = c.mean;
        row[`band${j}`] = c.band;
        row[`ci${j}`] = c.ci;
      });
      return row;
    });
    const points: PointRow[] = trend.revisions.flatMap((r, i) =>
      r.points.map((p, k) => ({ x: i + jitter(k, r.points.length), y: p.value, u: p.u, capture: p.label, variant: p.variant, revision: r.label, colour: colours[Math.max(0, variants.indexOf(p.variant))] ?? colours[0]! })),
    );
    const ys = [...points.map((p) => p.y), ...means.flatMap((m) => m.series.flatMap((c) => (c.band ? c.band : []))), ...metricTargets.map((t) => t.value)];
    let lo = ys.length ? Math.min(...ys) : 0;
    let hi = ys.length ? Math.max(...ys) : 1;
    if (hi - lo < 1e-9) {
      lo -= Math.abs(lo) * 0.1 || 0.5;
      hi += Math.abs(hi) * 0.1 || 0.5;
    }
    // round ticks (1, 2 or 5 × 10^k apart) read better than the data's own extremes
    const raw = (hi - lo) / 5;
    const mag = 10 ** Math.floor(Math.log10(raw));
    const step = ([1, 2, 5, 10].find((f) => f * mag >= raw) ?? 10) * mag;
    // no negative axis for quantities that cannot be negative
    const start = Math.max(lo >= 0 ? 0 : -Infinity, Math.floor(lo / step) * step);
    const end = Math.ceil(hi / step) * step;
    const ticks: number[] = [];
    for (let v = start; v <= end + step / 2; v += step) ticks.push(Number(v.toPrecision(12)));
    return { means, points, domain: [start, end] as [number, number], ticks, variants, colours };
  }, [trend, metricTargets]);

  const open = (id: string) => router.push(`/projects/${projectId}/revisions/${id}`);
  const pick = (key: MetricKey) => {
    setMetric(key);
    const url = new URL(window.location.href);
    url.searchParams.set('metric', key);
    window.history.replaceState(null, '', url);
  };
  const tick = (v: number) => formatTick(metric, v);

  return (
    <div>
      <div className="mb-3 flex flex-wrap items-center gap-2" role="group" aria-label="Metric">
        {METRIC_LIST.map((m) => {
          const has = withData.some((w) => w.key === m.key);
          return (
            <button
              key={m.key}
              type="button"
              onClick={() => pick(m.key)}
              aria-pressed={metric === m.key}
              className={
                metric === m.key
                  ? 'rounded-full border border-beam bg-beam/15 px-3 py-1 text-xs font-medium text-ink'
                  : `rounded-full border border-line px-3 py-1 text-xs hover:border-beam/60 ${has ? 'text-ink' : 'text-muted/60'}`
              }
            >
              {m.short}
            </button>
          );
        })}
      </div>
      {means.length === 0 ? (
        <p className="text-sm text-muted">No revisions yet.</p>
      ) : (
        <div data-testid="trend-chart" data-metric={metric} className="h-80 w-full">
          <ResponsiveContainer width="100%" height="100%">
            <ComposedChart data={means} margin={{ top: 16, right: 24, bottom: 24, left: 8 }}>
              <CartesianGrid stroke="rgb(var(--line))" strokeDasharray="2 4" />
              <XAxis
                dataKey="x"
                type="number"
                domain={[-0.5, means.length - 0.5]}
                ticks={means.map((m) => m.x)}
                tickFormatter={(v: number) => means[Math.round(v)]?.label ?? ''}
                stroke="rgb(var(--muted))"
                tick={{ fontSize: 11 }}
                allowDecimals={false}
              />
              <YAxis
                type="number"
                domain={domain}
                ticks={ticks}
                tickFormatter={tick}
                width={56}
                stroke="rgb(var(--muted))"
                tick={{ fontSize: 11 }}
                label={{ value: metricHeading(metric), angle: -90, position: 'insideLeft', offset: 4, fill: 'rgb(var(--muted))', fontSize: 11, style: { textAnchor: 'middle' } }}
                allowDataOverflow
              />
              <Tooltip content={<TrendTooltip metric={metric} variants={variants} colours={colours} />} cursor={{ stroke: 'rgb(var(--line))' }} />
              {variants.map((v, j) => (
                <Area
                  key={`band-${j}`}
                  dataKey={`band${j}`}
                  className="vm-ci-band"
                  data-variant={v}
                  type="linear"
                  stroke="none"
                  fill={colours[j]}
                  fillOpacity={variants.length > 1 ? 0.1 : 0.16}
                  isAnimationActive={false}
                  connectNulls
                  activeDot={false}
                />
              ))}
              {variants.map((v, j) => (
                <Line
                  key={`line-${j}`}
                  dataKey={`mean${j}`}
                  name={variantLabel(v)}
                  className="vm-trend-line"
                  type="linear"
                  stroke={colours[j]}
                  strokeWidth={2}
                  strokeDasharray={j % 2 === 1 ? '7 3' : undefined}
                  connectNulls
                  isAnimationActive={false}
                  dot={(p: unknown) => {
                    const d = p as { cx?: number; cy?: number; payload?: MeanRow; index?: number };
                    return <MeanDot key={`${j}-${d.index}`} cx={d.cx} cy={d.cy} payload={d.payload} onOpen={open} colour={colours[j] ?? ''} variant={v} j={j} />;
                  }}
                  activeDot={false}
                >
                  <ErrorBar dataKey={`ci${j}`} className="vm-ci-whisker" width={10} stroke={colours[j]} strokeWidth={1.5} isAnimationActive={false} />
                </Line>
              ))}
              <Scatter data={points} dataKey="y" className="vm-trend-points" shape={PointDot} isAnimationActive={false} />
              {metricTargets.map((t) => (
                <ReferenceLine
                  key={t.id}
                  y={t.value}
                  className="vm-target-line"
                  stroke={t.comparator === '>=' ? 'rgb(var(--pass))' : 'rgb(var(--fail))'}
                  strokeDasharray="6 4"
                  strokeWidth={1.5}
                  ifOverflow="extendDomain"
                  label={{ value: `target ${t.comparator === '>=' ? '≥' : '≤'} ${formatLimit(metric, t.value)}${t.isDefault ? ' (default)' : ''}`, position: 'insideTopRight', fill: 'rgb(var(--muted))', fontSize: 10 }}
                />
              ))}
            </ComposedChart>
          </ResponsiveContainer>
        </div>
      )}
      {variants.length > 1 ? (
        <ul className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink" data-testid="trend-legend" aria-label="Variants">
          {variants.map((v, j) => (
            <li key={v} className="inline-flex items-center gap-1.5" data-variant={v}>
              <svg width="22" height="10" aria-hidden="true">
                <line x1="0" y1="5" x2="22" y2="5" stroke={colours[j]} strokeWidth="2" strokeDasharray={j % 2 === 1 ? '7 3' : undefined} />
                <circle cx="11" cy="5" r="3.5" fill={colours[j]} />
              </svg>
              {variantLabel(v)}
            </li>
          ))}
        </ul>
      ) : null}
      <p className="mt-2 text-xs text-muted">
        Dots: each capture set’s newest reading. {variants.length > 1 ? 'One line per variant, never a blend of them: ' : 'Line: '}the mean; band and whiskers: its 95% confidence interval
        (Student’s t, from 2 captures on). Dashed: targets
        {metricTargets.length ? ` (${metricTargets.map((t) => `${comparatorWords(t.comparator)} ${formatLimit(metric, t.value)}`).join(', ')})` : ' — none set for this metric'}. Click a mean to open its
        revision.
      </p>
    </div>
  );
}
