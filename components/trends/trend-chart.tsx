'use client';

import { useRouter } from 'next/navigation';
import { useMemo, useState } from 'react';
import { Area, CartesianGrid, ComposedChart, ErrorBar, Line, ReferenceLine, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import { comparatorWords, type Target } from '@/lib/targets/evaluate';
import { formatMetric, metricLabelWithUnit, METRIC_LIST, METRICS, type MetricKey } from '@/lib/targets/metrics';
import type { Trend } from '@/lib/targets/series';

type MeanRow = { x: number; id: string; label: string; n: number; mean: number | null; band: [number, number] | null; low: number | null; high: number | null; ci: [number, number] | null };
type PointRow = { x: number; y: number; capture: string; variant: string; revision: string };

// Spreads a revision's captures a little sideways so equal values do not hide each other.
function jitter(i: number, n: number): number {
  if (n <= 1) return 0;
  return ((i / (n - 1)) * 2 - 1) * Math.min(0.18, 0.03 * n);
}

function MeanDot(props: { cx?: number; cy?: number; payload?: MeanRow; onOpen: (id: string) => void }) {
  const { cx, cy, payload, onOpen } = props;
  if (cx === undefined || cy === undefined || !payload || payload.mean === null) return <g />;
  return (
    <g
      className="vm-trend-mean"
      data-testid="trend-mean"
      role="link"
      tabIndex={0}
      aria-label={`Open revision ${payload.label}`}
      style={{ cursor: 'pointer' }}
      onClick={() => onOpen(payload.id)}
      onKeyDown={(e) => {
        if (e.key === 'Enter') onOpen(payload.id);
      }}
    >
      <circle cx={cx} cy={cy} r={6} fill="rgb(var(--beam))" stroke="rgb(var(--canvas))" strokeWidth={2} />
    </g>
  );
}

function PointDot(props: unknown) {
  const { cx, cy, payload } = props as { cx?: number; cy?: number; payload?: PointRow };
  if (cx === undefined || cy === undefined || !payload) return <g />;
  return <circle className="vm-trend-point" data-testid="trend-point" cx={cx} cy={cy} r={3.5} fill="rgb(var(--glow))" fillOpacity={0.85} />;
}

function TrendTooltip({ active, payload, metric }: { active?: boolean; payload?: { payload?: MeanRow | PointRow }[]; metric: MetricKey }) {
  const row = active ? payload?.[0]?.payload : undefined;
  if (!row) return null;
  const box = 'rounded-md border border-line bg-panel px-3 py-2 text-xs text-ink shadow-lg';
  if ('capture' in row) {
    return (
      <div className={box}>
        <p className="font-semibold">{row.capture}</p>
        <p className="text-muted">
          {row.revision}
          {row.variant ? ` · ${row.variant}` : ''}
        </p>
        <p className="font-mono">{formatMetric(metric, row.y)}</p>
      </div>
    );
  }
  return (
    <div className={box}>
      <p className="font-semibold">{row.label}</p>
      {row.mean === null ? (
        <p className="text-muted">no readings</p>
      ) : (
        <>
          <p className="font-mono">mean {formatMetric(metric, row.mean)}</p>
          {row.low !== null && row.high !== null ? (
            <p className="font-mono text-muted">
              95% CI {formatMetric(metric, row.low, false)} – {formatMetric(metric, row.high, false)}
            </p>
          ) : null}
          <p className="text-muted">
            {row.n} capture set{row.n === 1 ? '' : 's'} · click to open
          </p>
        </>
      )}
    </div>
  );
}

/**
 * One metric across the revisions in their order: the mean with its 95% CI as a band, each
 * capture set's newest reading as a dot, and the project's targets as dashed lines.
 */
export function TrendChart({ projectId, trends, targets, initialMetric }: { projectId: string; trends: Record<MetricKey, Trend>; targets: Target[]; initialMetric?: MetricKey }) {
  const router = useRouter();
  const withData = METRIC_LIST.filter((m) => trends[m.key].revisions.some((r) => r.points.length > 0));
  const [metric, setMetric] = useState<MetricKey>(initialMetric ?? withData[0]?.key ?? 'ambientContrastRatio');
  const info = METRICS[metric];
  const trend = trends[metric];
  const metricTargets = targets.filter((t) => t.metric === metric);

  const { means, points, domain, ticks } = useMemo(() => {
    const means: MeanRow[] = trend.revisions.map((r, i) => ({
      x: i,
      id: r.id,
      label: r.label,
      n: r.stats.n,
      mean: r.stats.mean,
      low: r.stats.low,
      high: r.stats.high,
      band: r.stats.low !== null && r.stats.high !== null ? [r.stats.low, r.stats.high] : null,
      // the same interval as whiskers on the mean: it still shows where a revision stands alone
      ci: r.stats.mean !== null && r.stats.low !== null && r.stats.high !== null ? [r.stats.mean - r.stats.low, r.stats.high - r.stats.mean] : null,
    }));
    const points: PointRow[] = trend.revisions.flatMap((r, i) => r.points.map((p, j) => ({ x: i + jitter(j, r.points.length), y: p.value, capture: p.label, variant: p.variant, revision: r.label })));
    const ys = [...points.map((p) => p.y), ...means.flatMap((m) => (m.band ? m.band : [])), ...metricTargets.map((t) => t.value)];
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
    const start = Math.floor(lo / step) * step;
    const end = Math.ceil(hi / step) * step;
    const ticks: number[] = [];
    for (let v = start; v <= end + step / 2; v += step) ticks.push(Number(v.toPrecision(12)));
    return { means, points, domain: [start, end] as [number, number], ticks };
  }, [trend, metricTargets]);

  const open = (id: string) => router.push(`/projects/${projectId}/revisions/${id}`);
  const pick = (key: MetricKey) => {
    setMetric(key);
    const url = new URL(window.location.href);
    url.searchParams.set('metric', key);
    window.history.replaceState(null, '', url);
  };
  const tick = (v: number) => Number(v.toPrecision(4)).toString();

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
                label={{ value: metricLabelWithUnit(info), angle: -90, position: 'insideLeft', offset: 4, fill: 'rgb(var(--muted))', fontSize: 11, style: { textAnchor: 'middle' } }}
                allowDataOverflow
              />
              <Tooltip content={<TrendTooltip metric={metric} />} cursor={{ stroke: 'rgb(var(--line))' }} />
              <Area dataKey="band" className="vm-ci-band" type="linear" stroke="none" fill="rgb(var(--beam))" fillOpacity={0.16} isAnimationActive={false} connectNulls activeDot={false} />
              <Line dataKey="mean" className="vm-trend-line" type="linear" stroke="rgb(var(--beam))" strokeWidth={2} connectNulls isAnimationActive={false} dot={(p: unknown) => {
                  const d = p as { cx?: number; cy?: number; payload?: MeanRow; index?: number };
                  return <MeanDot key={d.index} cx={d.cx} cy={d.cy} payload={d.payload} onOpen={open} />;
                }} activeDot={false}>
                <ErrorBar dataKey="ci" className="vm-ci-whisker" width={10} stroke="rgb(var(--beam))" strokeWidth={1.5} isAnimationActive={false} />
              </Line>
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
                  label={{ value: `target ${t.comparator === '>=' ? '≥' : '≤'} ${formatMetric(metric, t.value)}${t.isDefault ? ' (default)' : ''}`, position: 'insideTopRight', fill: 'rgb(var(--muted))', fontSize: 10 }}
                />
              ))}
            </ComposedChart>
          </ResponsiveContainer>
        </div>
      )}
      <p className="mt-2 text-xs text-muted">
        Dots: each capture set’s newest reading. Line: the revision mean; band and whiskers: its 95% confidence interval (Student’s t, from 2 captures on). Dashed: targets
        {metricTargets.length ? ` (${metricTargets.map((t) => `${comparatorWords(t.comparator)} ${formatMetric(metric, t.value)}`).join(', ')})` : ' — none set for this metric'}. Click a mean to open its
        revision.
      </p>
    </div>
  );
}
