// Quantities that are not one of the measured metrics: fractions from the planner, contrast
// ratios, luminances and illuminances.
import { DASH, decimalsForUncertainty, fixed, isNum, significant } from './numbers';

/** A fraction as a percentage to three significant digits: 0.1152 → "11.5 %", 0.0024 → "0.240 %". */
export function formatPercent(v: number | null | undefined, o: { uncertainty?: number | null } = {}): string {
  if (!isNum(v)) return DASH;
  const p = v * 100;
  if (p === 0) return '0 %';
  const d = decimalsForUncertainty(isNum(o.uncertainty) ? o.uncertainty * 100 : null);
  return `${d === null ? significant(p, 3) : fixed(p, d)} %`;
}

/** A contrast ratio: "1.84 : 1", "12.3 : 1", "1,234 : 1"; ∞ for a black background. */
export function formatRatio(v: number | null | undefined, o: { uncertainty?: number | null } = {}): string {
  if (v === Number.POSITIVE_INFINITY) return '∞ : 1';
  if (!isNum(v)) return DASH;
  const d = decimalsForUncertainty(o.uncertainty);
  return `${d === null ? significant(v, 3) : fixed(v, d)} : 1`;
}

/**
 * A luminance in cd/m²: "12,000 cd/m²", "85.3 cd/m²". A rough estimate (the meter equation
 * without a camera profile) keeps two significant digits and an "≈": 729.7 → "≈730 cd/m²".
 */
export function formatLuminance(v: number | null | undefined, o: { estimate?: boolean; uncertainty?: number | null } = {}): string {
  if (!isNum(v)) return DASH;
  if (o.estimate) return `≈${significant(v, 2)} cd/m²`;
  const d = decimalsForUncertainty(o.uncertainty);
  if (d !== null) return `${fixed(v, d)} cd/m²`;
  const rounded = Math.abs(v) >= 100 ? Math.round(v) : Math.round(v * 10) / 10;
  return `${rounded.toLocaleString('en-US')} cd/m²`;
}

/** An illuminance in lux: "500 lx", "12,000 lx". */
export function formatIlluminance(v: number | null | undefined): string {
  if (!isNum(v)) return DASH;
  const rounded = Math.abs(v) >= 100 ? Math.round(v) : Math.round(v * 10) / 10;
  return `${rounded.toLocaleString('en-US')} lx`;
}

/** A short axis label for a luminance: 40000 → "40k". */
export function formatLuminanceTick(v: number): string {
  if (v >= 1000) return `${(v / 1000).toLocaleString('en-US', { maximumFractionDigits: 1 })}k`;
  return String(v);
}

/** A relative change as a signed percentage: "+32.9 %", "−4.0 %", "+120 %"; "—" without one. */
export function formatRelativeChange(c: number | null | undefined): string {
  if (!isNum(c)) return DASH;
  const pct = Math.abs(c * 100);
  return `${c >= 0 ? '+' : '−'}${fixed(pct, pct >= 100 ? 0 : 1)} %`;
}

/** A test statistic with fixed decimals (t to 2, df to 1); "—" when missing. */
export function formatStatistic(v: number | null | undefined, decimals: number): string {
  return isNum(v) ? fixed(v, decimals) : DASH;
}

/** A plain number to n significant digits ("—" when missing). */
export function formatSig(v: number | null | undefined, sig = 3): string {
  return isNum(v) ? significant(v, sig) : DASH;
}
