// Number formats shared by the planner, the comparison table and the tests, so that what the
// tests expect and what the page shows cannot drift apart.

/** A fraction as a percentage: 0.1152 → "11.5 %"; small values keep three significant digits. */
export function formatPercent(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const p = v * 100;
  if (p === 0) return '0 %';
  if (Math.abs(p) < 1) return `${p.toPrecision(3)} %`;
  return `${p.toFixed(1)} %`;
}

/** A contrast ratio: "1.84 : 1"; large ones lose their decimals. */
export function formatRatio(v: number | null | undefined): string {
  if (v === null || v === undefined) return '—';
  if (v === Number.POSITIVE_INFINITY) return '∞';
  if (!Number.isFinite(v)) return '—';
  if (v >= 100) return `${Math.round(v).toLocaleString('en-US')} : 1`;
  if (v >= 10) return `${v.toFixed(1)} : 1`;
  return `${v.toFixed(2)} : 1`;
}

/** A luminance in cd/m² with thousands separators: 12000 → "12,000 cd/m²". */
export function formatLuminance(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const rounded = v >= 100 ? Math.round(v) : Math.round(v * 10) / 10;
  return `${rounded.toLocaleString('en-US')} cd/m²`;
}

/** A short axis label for a luminance: 40000 → "40k". */
export function formatLuminanceTick(v: number): string {
  if (v >= 1000) return `${(v / 1000).toLocaleString('en-US', { maximumFractionDigits: 1 })}k`;
  return String(v);
}
