'use client';

import { CartesianGrid, ComposedChart, ErrorBar, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import { formatMetricMeanCi, formatMetricValue, formatTick, metricHeading } from '@/lib/format';
import type { ChangeTone, MetricComparison } from '@/lib/targets/compare';
import type { MetricKey } from '@/lib/targets/metrics';

type MeanRow = { x: number; mean: number; ci: [number, number] | null; label: string; text: string };
type PointRow = { x: number; y: number; label: string; text: string };

export const TONE_CLASS: Record<ChangeTone, string> = { good: 'text-pass', bad: 'text-fail', unclear: 'text-muted' };
export const TONE_WORDS: Record<ChangeTone, string> = { good: 'better for your targets', bad: 'worse for your targets', unclear: 'no clear change' };
const GROUP_COLOUR = ['#0072B2', '#E69F00'];

// Spreads a group's captures a little sideways so equal values do not hide each other.
const jitter = (i: number, n: number) => (n <= 1 ? 0 : ((i / (n - 1)) * 2 - 1) * 0.16);

function MeanMark(props: unknown) {
  const { cx, cy, payload } = props as { cx?: number; cy?: number; payload?: MeanRow };
  if (cx === undefined || cy === undefined || !payload) return <g />;
  return <rect data-testid="compare-mean" x={cx - 14} y={cy - 1.5} width={28} height={3} fill={GROUP_COLOUR[payload.x] ?? 'rgb(var(--beam))'} />;
}

function PointMark(props: unknown) {
  const { cx, cy, payload } = props as { cx?: number; cy?: number; payload?: PointRow };
  if (cx === undefined || cy === undefined || !payload) return <g />;
  return <circle data-testid="compare-point" cx={cx} cy={cy} r={3} fill={GROUP_COLOUR[payload.x] ?? 'rgb(var(--glow))'} fillOpacity={0.55} />;
}

function Tip({ active, payload }: { active?: boolean; payload?: { payload?: MeanRow | PointRow }[] }) {
  const row = active ? payload?.[0]?.payload : undefined;
  if (!row) return null;
  return (
    <div className="rounded-md border border-line bg-panel px-2 py-1 text-xs text-ink shadow-lg">
      <p className="font-semibold">{row.label}</p>
      <p className="font-mono">{row.text}</p>
    </div>
  );
}

function MetricChart({ row, a, b, aLabel, bLabel, tone }: { row: MetricComparison; a: number[]; b: number[]; aLabel: string; bLabel: string; tone: ChangeTone }) {
  const key: MetricKey = row.metric;
  const groups = [
    { s: row.a, pts: a, label: `A · ${aLabel}` },
    { s: row.b, pts: b, label: `B · ${bLabel}` },
  ];
  const means: MeanRow[] = groups.flatMap((g, x) =>
    g.s.mean === null ? [] : [{ x, mean: g.s.mean, ci: g.s.halfWidth === null ? null : ([g.s.halfWidth, g.s.halfWidth] as [number, number]), label: g.label, text: `mean ${formatMetricMeanCi(key, g.s)} (n ${g.s.n})` }],
  );
  const points: PointRow[] = groups.flatMap((g, x) => g.pts.map((y, i) => ({ x: x + jitter(i, g.pts.length), y, label: g.label, text: formatMetricValue(key, y) })));
  const ys = [...points.map((p) => p.y), ...groups.flatMap((g) => (g.s.low !== null && g.s.high !== null ? [g.s.low, g.s.high] : []))];
  const lo = ys.length ? Math.min(...ys) : 0;
  const hi = ys.length ? Math.max(...ys) : 1;
  const pad = (hi - lo) * 0.12 || Math.abs(hi) * 0.1 || 0.5;
  const domain: [number, number] = [lo >= 0 ? Math.max(0, lo - pad) : lo - pad, hi + pad];
  return (
    <figure className="rounded-md border border-line p-2" data-testid={`compare-chart-${key}`} data-tone={tone}>
      <figcaption className="flex flex-wrap items-baseline justify-between gap-2 px-1 text-xs">
        <span className="font-medium text-ink">{metricHeading(key)}</span>
        <span className={TONE_CLASS[tone]}>{TONE_WORDS[tone]}</span>
      </figcaption>
      <div className="h-44 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart margin={{ top: 8, right: 12, bottom: 4, left: 4 }}>
            <CartesianGrid stroke="rgb(var(--line))" strokeDasharray="2 4" />
            <XAxis dataKey="x" type="number" domain={[-0.5, 1.5]} ticks={[0, 1]} tickFormatter={(v: number) => (v === 0 ? 'A' : 'B')} stroke="rgb(var(--muted))" tick={{ fontSize: 11 }} />
            <YAxis type="number" domain={domain} tickFormatter={(v: number) => formatTick(key, v)} width={48} stroke="rgb(var(--muted))" tick={{ fontSize: 10 }} allowDataOverflow />
            <Tooltip content={<Tip />} cursor={false} />
            <Scatter data={points} dataKey="y" shape={PointMark} isAnimationActive={false} />
            <Scatter data={means} dataKey="mean" shape={MeanMark} isAnimationActive={false}>
              <ErrorBar dataKey="ci" direction="y" width={8} stroke="rgb(var(--ink))" strokeWidth={1.5} />
            </Scatter>
          </ComposedChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}

/**
 * Per metric, each group's captures as dots, its mean as a bar and the 95% CI as whiskers; the
 * caption says whether the change is good or bad for the team's targets.
 */
export function ComparisonChart({
  rows,
  points,
  tones,
  aLabel,
  bLabel,
}: {
  rows: MetricComparison[];
  points: Record<string, { a: number[]; b: number[] }>;
  tones: Record<string, ChangeTone>;
  aLabel: string;
  bLabel: string;
}) {
  const shown = rows.filter((r) => r.level !== 'no-data');
  return (
    <div>
      <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3" data-testid="comparison-chart">
        {shown.map((r) => (
          <MetricChart key={r.metric} row={r} a={points[r.metric]?.a ?? []} b={points[r.metric]?.b ?? []} aLabel={aLabel} bLabel={bLabel} tone={tones[r.metric] ?? 'unclear'} />
        ))}
      </div>
      <p className="mt-2 flex flex-wrap gap-x-4 text-xs text-muted">
        <span>
          <span className="mr-1 inline-block h-2.5 w-2.5 rounded-full align-middle" style={{ background: GROUP_COLOUR[0] }} /> A · {aLabel}
        </span>
        <span>
          <span className="mr-1 inline-block h-2.5 w-2.5 rounded-full align-middle" style={{ background: GROUP_COLOUR[1] }} /> B · {bLabel}
        </span>
        <span>Dots: captures (newest reading each). Bar: mean. Whiskers: 95% CI of the mean (Student’s t).</span>
      </p>
    </div>
  );
}
