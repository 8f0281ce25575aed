import { mean } from '../stats';
import { meetsCondition, type TargetCondition } from './conditions';
import type { MetricKey } from './metrics';
import { values, type SetReading } from './series';

export type Comparator = '>=' | '<=';

export type Target = {
  id: string;
  projectId: string;
  metric: MetricKey;
  comparator: Comparator;
  value: number;
  /** Free-text note kept beside the structured condition. */
  conditionNote: string;
  /** The lighting and pattern the target is meant under; only capture sets that meet it are judged. */
  condition?: TargetCondition;
  /** The variants the target is judged on; empty: every variant of a revision, each on its own. */
  variants?: string[];
  isDefault: boolean;
};

export type TargetStatus = 'pass' | 'fail' | 'no-data';

export type TargetCheck = {
  target: Target;
  status: TargetStatus;
  /** Mean of the values judged; null without data. */
  mean: number | null;
  n: number;
  /** The variant judged ('' for captures without a label); undefined when judged on values alone. */
  variant?: string;
  /** Capture sets of that variant left out because their stated conditions do not meet the target's. */
  excluded?: number;
  /** Why they were left out, one phrase per reason ("ambient illuminance not stated"). */
  excludedWhy?: string[];
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

/** The variants of a set of readings, sorted, the unlabelled ('') first. */
export function variantsOf(readings: readonly SetReading[]): string[] {
  return [...new Set(readings.map((r) => r.variant))].sort((a, b) => (a === '' ? -1 : b === '' ? 1 : a.localeCompare(b)));
}

/** One target on one variant's readings, only those whose stated conditions meet the target's. */
export function checkTargetOnVariant(target: Target, readings: readonly SetReading[], variant: string): TargetCheck {
  const mine = readings.filter((r) => r.variant === variant);
  const judged: SetReading[] = [];
  const why = new Set<string>();
  for (const r of mine) {
    const m = meetsCondition(target.condition ?? {}, r.conditions);
    if (m.ok) judged.push(r);
    else why.add(m.why);
  }
  const check = checkTarget(target, values(judged, target.metric));
  return { ...check, variant, excluded: mine.length - judged.length, excludedWhy: [...why] };
}

/**
 * Every target judged on each variant of one revision's readings (each capture set's newest),
 * never on a blend of variants: variant by variant, then target by target in the targets' order.
 * A target that names variants is judged on those only (a named variant without readings shows
 * as no data); one that names none, on every variant present.
 */
export function checkTargetsOn(targets: readonly Target[], readings: readonly SetReading[]): TargetCheck[] {
  const present = variantsOf(readings);
  const named = targets.flatMap((t) => t.variants ?? []);
  const all = [...new Set([...present, ...named])].sort((a, b) => (a === '' ? -1 : b === '' ? 1 : a.localeCompare(b)));
  const out: TargetCheck[] = [];
  for (const v of all.length ? all : ['']) {
    for (const t of targets) {
      const scope = t.variants?.length ? t.variants : present.length ? present : [''];
      if (!scope.includes(v)) continue;
      out.push(checkTargetOnVariant(t, readings, v));
    }
  }
  return out;
}

/** The variant as people read it: “with polarizer”, or “no variant label”. */
export function variantName(v: string): string {
  return v ? `“${v}”` : 'no variant label';
}

export type VariantVerdict = { variant: string; tally: StatusTally; passes: boolean };

/** Per variant judged: its tally, and whether it meets every target judged on it (one at least). */
export function verdictsByVariant(checks: readonly TargetCheck[]): VariantVerdict[] {
  const by = new Map<string, TargetCheck[]>();
  for (const c of checks) {
    const k = c.variant ?? '';
    by.set(k, [...(by.get(k) ?? []), c]);
  }
  return [...by].map(([variant, cs]) => {
    const t = tally(cs);
    return { variant, tally: t, passes: t.fail === 0 && t.pass > 0 };
  });
}

/**
 * The revision's verdict in words, per variant when it has more than one: "meets all 3 targets as
 * “with polarizer”; fails 1 of 3 targets as “no polarizer”". A revision passes only as the
 * variants that meet every target judged on them.
 */
export function revisionVerdictText(checks: readonly TargetCheck[]): string {
  const vs = verdictsByVariant(checks);
  if (vs.length === 0) return tallyText({ pass: 0, fail: 0, noData: 0 });
  if (vs.length === 1 && vs[0]!.variant === '') return tallyText(vs[0]!.tally);
  return vs.map((v) => `${tallyText(v.tally)} as ${variantName(v.variant)}`).join('; ');
}

/** Worst-first sort key for a list of revisions or projects: 0 failing somewhere, 1 passing, 2 nothing judged. */
export function verdictSortKey(checks: readonly TargetCheck[]): number {
  const t = tally(checks);
  return t.fail > 0 ? 0 : t.pass > 0 ? 1 : 2;
}
