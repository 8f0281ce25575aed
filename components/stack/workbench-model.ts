// The workbench's logic as plain functions (no React): where each reading goes on the chart, the
// stack of each variant, and predicted against measured per variant. The component only holds
// state and draws; the tests call these directly.
import { predictedContrastRatio, type StackPrediction } from '@/lib/optics';
import type { Handedness } from '@/lib/optics/handedness';
import { stackElementSchema, stackSchema, variantStacksSchema, type Stack, type StackElement, type VariantChange, type VariantStacks } from '@/lib/schemas/stack';
import { formatLuminance } from '@/lib/format';
import { summarise } from '@/lib/stats';
import { applyWhatIf, fromDraft, mean, median, safePredict, toDraft, type DraftElement, type MeasuredPoint } from './planner-model';

export const CHART_MIN = 10;
export const CHART_MAX = 40_000;

/** Where a reading's background luminance comes from: typed by the tester, a camera profile, or the rough EXIF estimate. */
export type BackgroundSource = 'typed' | 'calibrated' | 'estimate';

/** The background a reading is placed at: a typed value first, then a calibrated one, then the estimate. */
export function backgroundOf(m: Pick<MeasuredPoint, 'backgroundCdm2' | 'photoBackground'>): { cdm2: number; source: BackgroundSource } | null {
  if (m.backgroundCdm2 !== null && m.backgroundCdm2 > 0) return { cdm2: m.backgroundCdm2, source: 'typed' };
  const p = m.photoBackground;
  if (p && p.cdm2 > 0) return { cdm2: p.cdm2, source: p.kind === 'calibrated' ? 'calibrated' : 'estimate' };
  return null;
}

export type PlottedPoint = { x: number; y: number; label: string; estimate: boolean; variant: string; source: BackgroundSource };

/** Splits the readings into those the chart can place and those it cannot, with the reason. */
export function placeMeasured(measured: readonly MeasuredPoint[], min = CHART_MIN, max = CHART_MAX): { plotted: PlottedPoint[]; unplotted: { point: MeasuredPoint; why: string }[] } {
  const plotted: PlottedPoint[] = [];
  const unplotted: { point: MeasuredPoint; why: string }[] = [];
  for (const m of measured) {
    const name = m.variant || 'reading';
    const bg = backgroundOf(m);
    if (m.ambientContrastRatio === null || !(m.ambientContrastRatio > 0)) unplotted.push({ point: m, why: 'no contrast ratio' });
    else if (!bg) unplotted.push({ point: m, why: 'no background luminance recorded, and no exposure data to estimate it' });
    else if (bg.cdm2 < min || bg.cdm2 > max) unplotted.push({ point: m, why: `background ${formatLuminance(bg.cdm2, { estimate: bg.source === 'estimate' })} is off the chart` });
    else {
      const estimate = bg.source === 'estimate';
      plotted.push({ x: bg.cdm2, y: m.ambientContrastRatio, label: estimate ? `${name} (background estimated from EXIF)` : name, estimate, variant: m.variant, source: bg.source });
    }
  }
  return { plotted, unplotted };
}

/** A stored variant map, keeping only what validates (a broken entry is dropped, not fatal). */
export function readVariantStacks(raw: unknown): VariantStacks {
  const whole = variantStacksSchema.safeParse(raw ?? {});
  if (whole.success) return whole.data;
  const out: VariantStacks = {};
  if (raw && typeof raw === 'object') {
    for (const [k, v] of Object.entries(raw as Record<string, unknown>)) {
      const one = variantStacksSchema.safeParse({ [k]: v });
      if (one.success) Object.assign(out, one.data);
    }
  }
  return out;
}

/** The base stack changed for a variant: its left-out elements dropped, its own added after the rest. */
export function applyVariantChange(base: Stack, change: VariantChange | undefined): Stack {
  if (!change) return base;
  const out = new Set(change.without);
  return { elements: [...base.elements.filter((_, i) => !out.has(i)), ...change.add] };
}

/** The variant's stack checked with the stack schema; the first problem in words when it fails. */
export function variantStack(base: Stack | null, change: VariantChange | undefined): { stack: Stack | null; error: string | null } {
  if (!base) return { stack: null, error: 'the base stack is not complete' };
  const parsed = stackSchema.safeParse(applyVariantChange(base, change));
  if (parsed.success) return { stack: parsed.data, error: null };
  return { stack: null, error: parsed.error.issues[0]?.message ?? 'the stack is not valid' };
}

/** The variants the planner offers: those measured on the revision and those with a stored change. */
export function plannerVariants(measured: readonly Pick<MeasuredPoint, 'variant'>[], stored: VariantStacks): string[] {
  return [...new Set([...measured.map((m) => m.variant).filter((v) => v !== ''), ...Object.keys(stored)])].sort((a, b) => a.localeCompare(b));
}

/** A variant's change as the form holds it: positions left out, added elements as drafts. */
export type VariantDraft = { without: number[]; add: DraftElement[] };

export function toVariantDrafts(stored: VariantStacks): Record<string, VariantDraft> {
  return Object.fromEntries(Object.entries(stored).map(([k, v]) => [k, { without: [...v.without], add: v.add.map((e) => toDraft(e)) }]));
}

/**
 * Form state back to a variant map, unchanged variants (nothing left out, nothing added) dropped;
 * positions past the end of the base stack (after an element was removed) are dropped too.
 */
export function fromVariantDrafts(drafts: Record<string, VariantDraft>, baseCount: number): { value: VariantStacks | null; errors: Record<string, string> } {
  const value: VariantStacks = {};
  const errors: Record<string, string> = {};
  for (const [name, d] of Object.entries(drafts)) {
    const without = [...new Set(d.without.filter((i) => i >= 0 && i < baseCount))].sort((a, b) => a - b);
    const add: StackElement[] = [];
    for (const el of d.add) {
      const one = stackElementSchema.safeParse(fromDraft(el));
      if (one.success) add.push(one.data);
      else errors[name] = one.error.issues[0]?.message ?? 'an added element is not valid';
    }
    if (without.length || d.add.length) value[name] = { without, add };
  }
  return { value: Object.keys(errors).length ? null : value, errors };
}

/** Predicted against measured for one group of readings under one stack. */
export type PredictedMeasured = {
  variant: string;
  readings: number;
  background: number | null;
  backgroundSource: BackgroundSource | null;
  acrPredicted: number | null;
  acrMeasured: number | null;
  ghostPredicted: number | null;
  ghostMeasured: number | null;
  tauPredicted: number | null;
  tauMeasured: number | null;
  stackError: string | null;
  /** The stack fitted to these readings: the display at the eye and the η that explain them. */
  fit: MeasuredFit;
  etaPredicted: number | null;
  /** The stack's predicted handedness, and what the orientation marker showed (null: no clear reading). */
  handedness: HandednessCheck;
};

/** Orientation readings clearer than this margin count (lib/photometry/stages/orientation.ts). */
export const ORIENTATION_CLEAR_MARGIN = 0.1;

export type HandednessCheck = {
  predicted: Handedness | null;
  /** The clear orientation readings: how many, and what they say (mixed when they disagree). */
  measured: { sets: number; mirrored: boolean | 'mixed'; turned: boolean | 'mixed' } | null;
  /** True when every clear reading agrees with the prediction, false when one does not, null when either is missing. */
  agrees: boolean | null;
};

/** The predicted handedness against the orientation marker's clear readings of one group. */
export function handednessCheck(predicted: Handedness | null, readings: readonly MeasuredPoint[]): HandednessCheck {
  const clear = readings.flatMap((r) => (r.orientation && r.orientation.margin >= ORIENTATION_CLEAR_MARGIN ? [r.orientation] : []));
  if (clear.length === 0) return { predicted, measured: null, agrees: null };
  const all = <T,>(f: (o: (typeof clear)[number]) => T): T | 'mixed' => (clear.every((o) => f(o) === f(clear[0]!)) ? f(clear[0]!) : 'mixed');
  const mirrored = all((o) => o.mirrored);
  const turned = all((o) => o.orientation === 'rotated-180' || o.orientation === 'upside-down-mirrored');
  const agrees = predicted === null ? null : mirrored === 'mixed' ? false : mirrored === (predicted === 'mirrored');
  return { predicted, measured: { sets: clear.length, mirrored, turned }, agrees };
}

const finite = (xs: (number | null)[]): number[] => xs.filter((x): x is number => x !== null && Number.isFinite(x));

/**
 * One variant's stack against its own readings only: the predicted contrast at the median of their
 * backgrounds (typed, calibrated or estimated, the weakest source named), beside the means.
 */
export function predictedAgainstMeasured(variant: string, stack: Stack | null, readings: readonly MeasuredPoint[], stackError: string | null = null): PredictedMeasured {
  const prediction: StackPrediction | null = safePredict(stack);
  const bgs = readings.map(backgroundOf).filter((b): b is NonNullable<typeof b> => b !== null);
  const background = median(bgs.map((b) => b.cdm2));
  const weakest: BackgroundSource | null = bgs.some((b) => b.source === 'estimate') ? 'estimate' : bgs.some((b) => b.source === 'calibrated') ? 'calibrated' : bgs.length ? 'typed' : null;
  const display = stack?.elements[0];
  const acrPredicted = prediction && background !== null && display?.kind === 'display' ? predictedContrastRatio(prediction.eta, display.luminance, prediction.tau, background) : null;
  return {
    variant,
    readings: readings.length,
    background,
    backgroundSource: weakest,
    acrPredicted,
    acrMeasured: mean(finite(readings.map((r) => r.ambientContrastRatio))),
    ghostPredicted: prediction?.ghost?.unpolarised ?? null,
    ghostMeasured: mean(finite(readings.map((r) => r.ghostRatio))),
    tauPredicted: prediction?.tau ?? null,
    tauMeasured: mean(finite(readings.map((r) => r.transmission))),
    stackError,
    fit: fitFromReadings(readings, display?.kind === 'display' ? display.luminance : null),
    etaPredicted: prediction?.eta ?? null,
    handedness: handednessCheck(prediction?.handedness ?? null, readings),
  };
}

/**
 * Per variant of a revision, its own stack (the base changed as the variant says) against its own
 * readings; readings without a variant label go with the base stack. Never a blend of variants.
 */
export function predictedAgainstMeasuredByVariant(base: Stack | null, stored: VariantStacks, measured: readonly MeasuredPoint[]): PredictedMeasured[] {
  const names = [...new Set(measured.map((m) => m.variant))];
  for (const k of Object.keys(stored)) if (!names.includes(k)) names.push(k);
  names.sort((a, b) => (a === '' ? -1 : b === '' ? 1 : a.localeCompare(b)));
  return names.map((v) => {
    const { stack, error } = v === '' ? { stack: base, error: base ? null : 'no stack' } : variantStack(base, stored[v]);
    return predictedAgainstMeasured(v, stack, measured.filter((m) => m.variant === v), error);
  });
}

/** What the readings say the stack does, fitted from them with a 95% interval. */
export type MeasuredFit = {
  /** Readings that had a contrast ratio, a transmission and a background. */
  n: number;
  /** Display light reaching the eye, cd/m²: (ACR − 1) · τ · L_background per reading (docs/method.md §6). */
  atEye: { mean: number; halfWidth: number | null } | null;
  /** The efficiency η that explains it: the light at the eye over the display's entered luminance. */
  eta: { mean: number; halfWidth: number | null } | null;
  /** True when a background came from the rough EXIF estimate. */
  estimated: boolean;
};

/**
 * Fits the stack to a group's readings. Each reading's contrast ratio is 1 + η·L_display / (τ·L_bg)
 * (docs/method.md §6), so η·L_display = (ACR − 1) · τ · L_bg with its own measured τ; the mean
 * and Student's t interval over the readings give the display at the eye and, over the entered
 * display luminance, the efficiency that explains them.
 */
export function fitFromReadings(readings: readonly MeasuredPoint[], displayLuminance: number | null): MeasuredFit {
  const atEye: number[] = [];
  let estimated = false;
  for (const r of readings) {
    const bg = backgroundOf(r);
    if (!bg || r.ambientContrastRatio === null || r.transmission === null || !(r.transmission > 0) || !Number.isFinite(r.ambientContrastRatio)) continue;
    atEye.push((r.ambientContrastRatio - 1) * r.transmission * bg.cdm2);
    if (bg.source === 'estimate') estimated = true;
  }
  if (atEye.length === 0) return { n: 0, atEye: null, eta: null, estimated };
  const s = summarise(atEye);
  const hw = s.ci?.halfWidth ?? null;
  const eta = displayLuminance && displayLuminance > 0 ? { mean: s.mean / displayLuminance, halfWidth: hw === null ? null : hw / displayLuminance } : null;
  return { n: atEye.length, atEye: { mean: s.mean, halfWidth: hw }, eta, estimated };
}

/** One candidate on the trade-off view: a splitter split with or without a polariser, or a measured variant. */
export type TradeOffPoint = { label: string; split: string; polariser: boolean; tau: number; acr: number; kind: 'candidate' | 'own' | 'measured' };

const SPLITS = [0.5, 0.4, 0.3] as const;

/**
 * See-through transmission against the contrast ratio at one background luminance, for the
 * common splits (50/50, 40/60, 30/70) and the stack's own, each with and without a world-side
 * polariser; the splitter's absorption is held as it is retuned (applyWhatIf). The measured
 * variants are added by the caller.
 */
export function tradeOffPoints(stack: Stack | null, backgroundCdm2: number): TradeOffPoint[] {
  if (!stack || !(backgroundCdm2 > 0)) return [];
  const display = stack.elements[0];
  if (display?.kind !== 'display') return [];
  const splitter = stack.elements.find((e) => e.kind === 'plate-beam-splitter');
  const combiner = stack.elements.find((e) => e.kind === 'combiner');
  const ownR = splitter?.kind === 'plate-beam-splitter' ? splitter.R : combiner?.kind === 'combiner' ? combiner.R : null;
  if (ownR === null) return [];
  const out: TradeOffPoint[] = [];
  const rs: { r: number; own: boolean }[] = [...SPLITS.map((r) => ({ r, own: false })), ...(SPLITS.some((r) => Math.abs(r - ownR) < 1e-9) ? [] : [{ r: ownR, own: true }])];
  for (const { r, own } of rs) {
    for (const polariser of [false, true]) {
      const w = { ...NO_WHAT_IF_FOR_TRADE, polariser, ...(splitter ? { splitterR: r } : { combinerR: r }) };
      const p = safePredict(applyWhatIf(stack, w));
      if (!p || !(p.tau > 0)) continue;
      const split = `${Math.round(r * 100)}/${Math.round((1 - r) * 100)}`;
      out.push({ label: `${split}${own ? ' (this stack)' : ''} · ${polariser ? 'with' : 'no'} polariser`, split, polariser, tau: p.tau, acr: predictedContrastRatio(p.eta, display.luminance, p.tau, backgroundCdm2), kind: own || Math.abs(r - ownR) < 1e-9 ? 'own' : 'candidate' });
    }
  }
  return out;
}

const NO_WHAT_IF_FOR_TRADE = { splitterR: null, combinerR: null, displayLuminance: null, polariser: null } as const;
