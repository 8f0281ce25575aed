import { mean } from '../stats';
import type { MetricKey } from './metrics';
import { values, type SetReading } from './series';

export type Comparator = '>=' | '<=';

export type Target = {
  id: string;
  projectId: string;
  metric: MetricKey;
  comparator: Comparator;
  value: number;
  conditionNote: string;
  isDefault: boolean;
};

export type TargetStatus = 'pass' | 'fail' | 'no-data';

export type TargetCheck = {
  target: Target;
  status: TargetStatus;
  /** Mean of the values judged; null without data. */
  mean: number | null;
  n: number;
};

/** True when a value meets the target (the boundary counts as met). */
export function meets(comparator: Comparator, limit: number, value: number): boolean {
  return comparator === '>=' ? value >= limit : value <= limit;
}

/**
 * Judges a target on the mean of a revision's values (the newest reading of each capture set):
 * one stray capture neither passes nor fails a build on its own.
 */
export function checkTarget(target: Target, values: readonly number[]): TargetCheck {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length === 0) return { target, status: 'no-data', mean: null, n: 0 };
  const m = mean(finite);
  return { target, status: meets(target.comparator, target.value, m) ? 'pass' : 'fail', mean: m, n: finite.length };
}

export type StatusTally = { pass: number; fail: number; noData: number };

export function tally(checks: readonly TargetCheck[]): StatusTally {
  const t: StatusTally = { pass: 0, fail: 0, noData: 0 };
  for (const c of checks) {
    if (c.status === 'pass') t.pass++;
    else if (c.status === 'fail') t.fail++;
    else t.noData++;
  }
  return t;
}

/** "Meets 2 of 3 targets" style summary; the word a status badge shows. */
export function tallyText(t: StatusTally): string {
  const judged = t.pass + t.fail;
  if (judged === 0) return t.noData ? 'no readings for its targets' : 'no targets';
  const noun = judged === 1 ? 'target' : 'targets';
  const base = t.fail === 0 ? (judged === 1 ? 'meets its target' : `meets all ${judged} ${noun}`) : `fails ${t.fail} of ${judged} ${noun}`;
  return t.noData ? `${base} (${t.noData} without readings)` : base;
}

export function comparatorWords(c: Comparator): string {
  return c === '>=' ? 'at least' : 'at most';
}

export const STATUS_WORDS: Record<TargetStatus, string> = { pass: 'pass', fail: 'fail', 'no-data': 'no data' };

/** Every target judged on one group's readings (each capture set's newest), in the targets' order. */
export function checkTargetsOn(targets: readonly Target[], readings: readonly SetReading[]): TargetCheck[] {
  return targets.map((t) => checkTarget(t, values(readings, t.metric)));
}
