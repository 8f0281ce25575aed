// Plain number rules shared by every figure Veilmeter prints: significant digits, rounding to an
// uncertainty, thousands separators. Each metric's unit and scale live in ./metrics.ts.

export const DASH = '—';
export const MINUS = '−';

const isNum = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/** Decimals that give `sig` significant digits to |v| (0 for v = 0 keeps "0"). */
export function decimalsForSig(v: number, sig: number): number {
  if (!Number.isFinite(v) || v === 0) return Math.max(0, sig - 1);
  const mag = Math.floor(Math.log10(Math.abs(v)));
  return Math.max(0, sig - 1 - mag);
}

/**
 * Decimals that keep two significant digits of an uncertainty, the value then rounded to the same
 * place (at most two significant digits for a stated uncertainty: JCGM 100:2008, GUM §7.2.6).
 * Null for a missing, zero or non-finite uncertainty.
 */
export function decimalsForUncertainty(u: number | null | undefined): number | null {
  if (!isNum(u) || u <= 0) return null;
  const mag = Math.floor(Math.log10(u));
  // 0.0995 rounds to 0.10 at two digits: recompute on the rounded figure so the count stays right
  const d = Math.max(0, 1 - mag);
  const rounded = Number(u.toFixed(d));
  return rounded >= 10 ** (mag + 1) ? Math.max(0, d - 1) : d;
}

/** Fixed decimals with thousands separators from 1,000, and a true minus sign. */
export function fixed(v: number, decimals: number): string {
  const d = Math.min(20, Math.max(0, decimals));
  let s = Math.abs(v) >= 1000 ? Math.abs(v).toLocaleString('en-US', { minimumFractionDigits: d, maximumFractionDigits: d }) : Math.abs(v).toFixed(d);
  // -0.00 prints as 0.00
  if (v < 0 && Number(s.replace(/,/g, '')) !== 0) s = `${MINUS}${s}`;
  return s;
}

/** A number to `sig` significant digits without exponent notation: 729.7 → "730" at 2. */
export function significant(v: number, sig: number): string {
  if (!Number.isFinite(v)) return DASH;
  if (v === 0) return '0';
  const mag = Math.floor(Math.log10(Math.abs(v)));
  if (mag >= sig - 1) {
    const step = 10 ** (mag - sig + 1);
    return fixed(Math.round(v / step) * step, 0);
  }
  return fixed(v, decimalsForSig(v, sig));
}

/** The shortest form of an exact figure someone typed (a target's limit): 1.2 → "1.2", 30 → "30". */
export function exact(v: number): string {
  if (!Number.isFinite(v)) return DASH;
  const s = String(Number(v.toPrecision(10)));
  if (/e/i.test(s)) return significant(v, 10);
  const neg = s.startsWith('-');
  const body = neg ? s.slice(1) : s;
  const [int = '0', frac] = body.split('.');
  const grouped = Math.abs(v) >= 1000 ? Number(int).toLocaleString('en-US') : int;
  return `${neg ? MINUS : ''}${grouped}${frac ? `.${frac}` : ''}`;
}

export { isNum };
