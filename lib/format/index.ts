// The one place numbers, units and dates are turned into text: every screen, CSV header, PDF and
// mail goes through here, so a figure reads the same wherever it appears.
import { DASH, fixed, isNum } from './numbers';

export * from './numbers';
export * from './metrics';
export * from './quantities';

/** Dates in ISO order: labs mix locales. */
export function formatDate(d: Date | string): string {
  const date = typeof d === 'string' ? new Date(d) : d;
  return date.toISOString().slice(0, 10);
}

export function formatDateTime(d: Date | string): string {
  const date = typeof d === 'string' ? new Date(d) : d;
  return date.toISOString().slice(0, 16).replace('T', ' ');
}

/** @deprecated A bare number with fixed decimals; use formatMetricValue or formatSig. */
export function formatNumber(v: number | null | undefined, digits = 3): string {
  if (!isNum(v)) return DASH;
  return fixed(v, digits);
}
