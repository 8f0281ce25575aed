import { type TwoSampleResult, welchTest } from './two-sample';
import { type GroupInput, toMoments } from './summary';

/** How strongly the data speak for a real difference. */
export type VerdictLevel = 'too-few' | 'unlikely-noise' | 'probably-real' | 'could-be-noise';

/** A plain-words comparison of a variant against a baseline. */
export interface Verdict {
  level: VerdictLevel;
  text: string;
  /** Welch comparison of variant − baseline; null when there are too few captures. */
  comparison: TwoSampleResult | null;
}

/** Inputs of a verdict. */
export interface VerdictInput {
  baseline: GroupInput;
  variant: GroupInput;
  /** What changed, e.g. "the polariser" (default "the variant"). */
  subject?: string;
  /** What was measured, e.g. "the ambient contrast ratio" (default "the value"). */
  metric?: string;
  /** Unit appended to the numbers, e.g. "cd/m²". */
  unit?: string;
  /** Fewest captures per group before a verdict is given (default 3). */
  minPerGroup?: number;
}

// Two significant digits of the ± part set the decimals of both numbers, so they read alike.
function decimalsFor(halfWidth: number, difference: number): number {
  const ref = halfWidth > 0 ? halfWidth : Math.abs(difference);
  if (!(ref > 0) || !Number.isFinite(ref)) return 2;
  return Math.min(6, Math.max(0, 1 - Math.floor(Math.log10(ref))));
}

/** p-value as a reader expects it: two decimals, three below 0.01, "< 0.001" below that. */
export function formatPValue(p: number): string {
  if (Number.isNaN(p)) throw new RangeError('p must be a number');
  if (p < 0.001) return 'p < 0.001';
  if (p < 0.01) return `p = ${p.toFixed(3)}`;
  return `p = ${p.toFixed(2)}`;
}

/** Words for a p-value: below 0.01, below 0.05, otherwise. */
export function levelFromP(p: number): Exclude<VerdictLevel, 'too-few'> {
  if (p < 0.01) return 'unlikely-noise';
  if (p < 0.05) return 'probably-real';
  return 'could-be-noise';
}

const LEVEL_WORDS: Record<Exclude<VerdictLevel, 'too-few'>, string> = {
  'unlikely-noise': 'unlikely to be noise',
  'probably-real': 'probably real, though more captures would firm it up',
  'could-be-noise': 'could be noise',
};

/**
 * Plain-words verdict on variant − baseline with Welch's test, e.g. "the polariser raises the
 * ambient contrast ratio by 0.31 ± 0.12; 5 vs 5 captures; unlikely to be noise, p = 0.002".
 * With fewer than 3 captures in either group it says it cannot tell.
 */
export function compareVerdict(input: VerdictInput): Verdict {
  const subject = input.subject ?? 'the variant';
  const metric = input.metric ?? 'the value';
  const unit = input.unit ? ` ${input.unit}` : '';
  const min = input.minPerGroup ?? 3;
  if (!Number.isInteger(min) || min < 2) throw new RangeError(`minPerGroup must be a whole number ≥ 2 (got ${min})`);
  const b = toMoments(input.baseline);
  const v = toMoments(input.variant);
  const counts = `${v.n} vs ${b.n} capture${v.n === 1 && b.n === 1 ? '' : 's'}`;
  if (v.n < min || b.n < min) {
    return {
      level: 'too-few',
      text: `Too few captures to tell whether ${subject} changes ${metric}: ${counts}, and at least ${min} in each group are needed.`,
      comparison: null,
    };
  }
  const c = welchTest(v, b);
  const level = levelFromP(c.p);
  const d = decimalsFor(c.ci.halfWidth, c.difference);
  const size = `${Math.abs(c.difference).toFixed(d)} ± ${c.ci.halfWidth.toFixed(d)}${unit}`;
  const change =
    Number(Math.abs(c.difference).toFixed(d)) === 0
      ? `leaves ${metric} unchanged (${c.difference >= 0 ? '+' : '−'}${size})`
      : `${c.difference > 0 ? 'raises' : 'lowers'} ${metric} by ${size}`;
  const text = `${subject.charAt(0).toUpperCase()}${subject.slice(1)} ${change}; ${counts}; ${LEVEL_WORDS[level]}, ${formatPValue(c.p)}.`;
  return { level, text, comparison: c };
}
