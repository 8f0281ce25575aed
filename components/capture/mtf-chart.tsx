'use client';

import { CartesianGrid, Line, LineChart, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';

/**
 * The slanted-edge MTF against spatial frequency in cycles per camera pixel, with MTF50 marked and
 * the camera's Nyquist frequency (0.5 cycle per pixel) drawn: above it the curve is what the
 * quarter-pixel bins resolve, not what a single photo's pixels can show.
 */
export function MtfChart({ curve, mtf50 }: { curve: { f: number; mtf: number }[]; mtf50: number }) {
  const top = Math.max(1.05, ...curve.map((p) => p.mtf));
  return (
    <div className="h-64 w-full" data-testid="mtf-chart" role="img" aria-label={`MTF curve; MTF50 at ${mtf50.toFixed(3)} cycles per pixel`}>
      <ResponsiveContainer width="100%" height="100%">
        <LineChart data={curve} margin={{ top: 12, right: 20, bottom: 28, left: 8 }}>
          <CartesianGrid stroke="rgb(var(--line))" strokeDasharray="2 4" />
          <XAxis
            dataKey="f"
            type="number"
            domain={[0, 1]}
            ticks={[0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1]}
            tick={{ fontSize: 11, fill: 'rgb(var(--muted))' }}
            label={{ value: 'spatial frequency (cycles per camera pixel)', position: 'insideBottom', offset: -16, fontSize: 11, fill: 'rgb(var(--muted))' }}
          />
          <YAxis
            type="number"
            domain={[0, Math.ceil(top * 10) / 10]}
            ticks={Array.from({ length: Math.floor((Math.ceil(top * 10) / 10) * 5 + 1e-9) + 1 }, (_, i) => i / 5)}
            tickFormatter={(v: number) => v.toFixed(1)}
            tick={{ fontSize: 11, fill: 'rgb(var(--muted))' }}
            label={{ value: 'MTF', angle: -90, position: 'insideLeft', fontSize: 11, fill: 'rgb(var(--muted))' }}
          />
          <Tooltip formatter={(v) => (typeof v === 'number' ? v.toFixed(3) : String(v))} labelFormatter={(f) => `${Number(f).toFixed(2)} cycles/pixel`} />
          <ReferenceLine y={0.5} stroke="rgb(var(--muted))" strokeDasharray="4 4" />
          <ReferenceLine x={0.5} stroke="rgb(var(--muted))" strokeDasharray="1 3" label={{ value: 'Nyquist', position: 'top', fontSize: 10, fill: 'rgb(var(--muted))' }} />
          <Line type="monotone" dataKey="mtf" stroke="rgb(var(--beam))" strokeWidth={2} dot={false} isAnimationActive={false} />
          <ReferenceDot x={mtf50} y={0.5} r={5} fill="rgb(var(--glow))" stroke="rgb(var(--canvas))" label={{ value: `MTF50 ${mtf50.toFixed(3)}`, position: 'right', fontSize: 11, fill: 'rgb(var(--ink))' }} />
        </LineChart>
      </ResponsiveContainer>
    </div>
  );
}
