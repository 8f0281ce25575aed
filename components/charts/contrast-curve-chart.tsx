'use client';

import { CartesianGrid, ComposedChart, Line, ReferenceLine, ResponsiveContainer, Scatter, XAxis, YAxis } from 'recharts';
import { formatLuminance, formatLuminanceTick, formatRatio } from '@/components/stack/format';

export type CurvePoint = { x: number; y: number };
export type MeasuredChartPoint = { x: number; y: number; label: string; estimate?: boolean };

export const CURVE_MIN = 10;
export const CURVE_MAX = 40_000;

const X_TICKS = [10, 100, 1000, 10_000, 40_000];
const Y_TICKS = [1, 1.2, 1.5, 2, 3, 5, 10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10_000, 100_000];

// Rough orders of magnitude so the axis reads as places rather than numbers.
const SURROUNDINGS = [
  { x: 100, label: 'indoors' },
  { x: 3000, label: 'overcast' },
  { x: 25_000, label: 'sunlit' },
];

const finitePoints = (pts: CurvePoint[]) => pts.filter((p) => Number.isFinite(p.y) && p.y > 0);

function MeasuredDot(props: unknown) {
  const { cx, cy, payload } = props as { cx?: number; cy?: number; payload?: MeasuredChartPoint };
  if (cx === undefined || cy === undefined || !payload) return <g />;
  return (
    <g className="vm-measured-point" data-testid="measured-point" data-estimate={payload.estimate ? 'yes' : 'no'}>
      {/* a background estimated from EXIF is drawn hollow: the x position is only roughly known */}
      {payload.estimate ? (
        <circle cx={cx} cy={cy} r={4.5} fill="none" stroke="rgb(var(--glow))" strokeWidth={2} />
      ) : (
        <circle cx={cx} cy={cy} r={5} fill="rgb(var(--glow))" stroke="rgb(var(--canvas))" strokeWidth={1.5} />
      )}
      <title>{`${payload.label}: ${formatRatio(payload.y)} at ${formatLuminance(payload.x, { estimate: payload.estimate })}`}</title>
    </g>
  );
}

/**
 * Predicted ambient contrast ratio against background luminance, both axes logarithmic, with
 * the measured readings placed at their recorded background.
 */
export function ContrastCurveChart({ stack, whatIf, measured }: { stack: CurvePoint[] | null; whatIf: CurvePoint[] | null; measured: MeasuredChartPoint[] }) {
  const curves = [...(stack ? finitePoints(stack) : []), ...(whatIf ? finitePoints(whatIf) : []), ...measured];
  const top = curves.reduce((m, p) => Math.max(m, p.y), 2);
  const yMax = Y_TICKS.find((t) => t >= top * 1.05) ?? top * 1.2;
  const yTicks = Y_TICKS.filter((t) => t <= yMax);

  return (
    <div data-testid="contrast-chart" className="h-80 w-full">
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart margin={{ top: 16, right: 20, bottom: 28, left: 8 }}>
          <CartesianGrid stroke="rgb(var(--line))" strokeDasharray="2 4" />
          <XAxis
            dataKey="x"
            type="number"
            scale="log"
            domain={[CURVE_MIN, CURVE_MAX]}
            ticks={X_TICKS}
            allowDataOverflow
            tickFormatter={formatLuminanceTick}
            stroke="rgb(var(--muted))"
            tick={{ fontSize: 11 }}
            label={{ value: 'Background luminance (cd/m², log)', position: 'insideBottom', offset: -16, fill: 'rgb(var(--muted))', fontSize: 11 }}
          />
          <YAxis
            dataKey="y"
            type="number"
            scale="log"
            domain={[1, yMax]}
            ticks={yTicks}
            allowDataOverflow
            width={48}
            stroke="rgb(var(--muted))"
            tick={{ fontSize: 11 }}
            tickFormatter={(v: number) => (v >= 1000 ? `${v / 1000}k` : String(v))}
            label={{ value: 'Contrast ratio', angle: -90, position: 'insideLeft', offset: 12, fill: 'rgb(var(--muted))', fontSize: 11 }}
          />
          {SURROUNDINGS.map((s) => (
            <ReferenceLine
              key={s.x}
              x={s.x}
              stroke="rgb(var(--line))"
              label={{ value: s.label, position: 'insideTopRight', fill: 'rgb(var(--muted))', fontSize: 10 }}
            />
          ))}
          {stack ? (
            <Line
              data={finitePoints(stack)}
              dataKey="y"
              name="Stack"
              className="vm-curve vm-curve-stack"
              type="monotone"
              stroke="rgb(var(--beam))"
              strokeWidth={2}
              dot={false}
              isAnimationActive={false}
            />
          ) : null}
          {whatIf ? (
            <Line
              data={finitePoints(whatIf)}
              dataKey="y"
              name="What-if"
              className="vm-curve vm-curve-whatif"
              type="monotone"
              stroke="rgb(var(--glow))"
              strokeDasharray="6 4"
              strokeWidth={2}
              dot={false}
              isAnimationActive={false}
            />
          ) : null}
          {measured.length ? (
            <Scatter data={measured} dataKey="y" name="Measured" className="vm-measured" shape={MeasuredDot} isAnimationActive={false} />
          ) : null}
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}
