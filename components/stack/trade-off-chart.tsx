'use client';

import { CartesianGrid, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from 'recharts';
import { formatLuminance, formatPercent, formatRatio, formatTick } from '@/lib/format';
import type { TradeOffPoint } from './workbench-model';

const COLOUR: Record<TradeOffPoint['kind'] | 'polariser', string> = { candidate: '#0072B2', own: '#009E73', measured: '#E69F00', polariser: '#CC79A7' };

function Mark(props: unknown) {
  const { cx, cy, payload } = props as { cx?: number; cy?: number; payload?: TradeOffPoint & { x: number } };
  if (cx === undefined || cy === undefined || !payload) return <g />;
  const fill = payload.kind === 'measured' ? COLOUR.measured : payload.kind === 'own' ? COLOUR.own : payload.polariser ? COLOUR.polariser : COLOUR.candidate;
  return (
    <g data-testid="trade-off-point" data-kind={payload.kind}>
      {payload.kind === 'measured' ? (
        <rect x={cx - 5} y={cy - 5} width={10} height={10} transform={`rotate(45 ${cx} ${cy})`} fill={fill} />
      ) : payload.polariser ? (
        <path d={`M${cx},${cy - 6} L${cx + 6},${cy + 5} L${cx - 6},${cy + 5} Z`} fill={fill} />
      ) : (
        <circle cx={cx} cy={cy} r={5} fill={fill} />
      )}
      <title>{`${payload.label}: ${formatPercent(payload.tau)} see-through, ${formatRatio(payload.acr)}`}</title>
    </g>
  );
}

/**
 * The choice the team faces: see-through transmission against the contrast ratio at its
 * background, for common splits with and without a polariser, with the measured variants on it.
 */
export function TradeOffChart({ points, backgroundCdm2, estimated }: { points: TradeOffPoint[]; backgroundCdm2: number; estimated: boolean }) {
  if (points.length === 0) return null;
  const data = points.map((p) => ({ ...p, x: p.tau * 100 }));
  return (
    <div data-testid="trade-off">
      <h3 className="mb-1 text-xs uppercase tracking-wider text-muted">
        See-through against contrast at {formatLuminance(backgroundCdm2, { estimate: estimated })} background
      </h3>
      <div className="h-64 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <ScatterChart margin={{ top: 10, right: 16, bottom: 24, left: 4 }}>
            <CartesianGrid stroke="rgb(var(--line))" strokeDasharray="2 4" />
            <XAxis dataKey="x" type="number" domain={[0, 'auto']} stroke="rgb(var(--muted))" tick={{ fontSize: 11 }} label={{ value: 'See-through transmission (%)', position: 'insideBottom', offset: -12, fill: 'rgb(var(--muted))', fontSize: 11 }} />
            <YAxis dataKey="acr" type="number" domain={[1, 'auto']} stroke="rgb(var(--muted))" tick={{ fontSize: 11 }} width={44} tickFormatter={(v: number) => formatTick('ambientContrastRatio', v)} label={{ value: 'Contrast ratio', angle: -90, position: 'insideLeft', fill: 'rgb(var(--muted))', fontSize: 11, style: { textAnchor: 'middle' } }} />
            <Tooltip cursor={false} content={({ active, payload }) => {
              const p = active ? (payload?.[0]?.payload as TradeOffPoint | undefined) : undefined;
              return p ? <div className="rounded-md border border-line bg-panel px-2 py-1 text-xs text-ink shadow-lg">{p.label}: {formatPercent(p.tau)} see-through, {formatRatio(p.acr)}</div> : null;
            }} />
            <Scatter data={data} shape={Mark} isAnimationActive={false} />
          </ScatterChart>
        </ResponsiveContainer>
      </div>
      <p className="mt-1 flex flex-wrap gap-x-4 text-xs text-muted">
        <span><span className="mr-1 inline-block h-2.5 w-2.5 rounded-full align-middle" style={{ background: COLOUR.candidate }} /> split, no polariser</span>
        <span><span className="mr-1 inline-block h-2.5 w-2.5 align-middle" style={{ background: COLOUR.polariser, clipPath: 'polygon(50% 0, 100% 100%, 0 100%)' }} /> split with polariser</span>
        <span><span className="mr-1 inline-block h-2.5 w-2.5 rounded-full align-middle" style={{ background: COLOUR.own }} /> this stack’s split</span>
        <span><span className="mr-1 inline-block h-2.5 w-2.5 rotate-45 align-middle" style={{ background: COLOUR.measured }} /> measured variants (means)</span>
      </p>
    </div>
  );
}
