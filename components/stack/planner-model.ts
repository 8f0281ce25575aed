// The editor's state and the what-if model, kept free of React so the server page, the browser
// and the tests compute the same predictions.
import { predictStack, type StackPrediction } from '@/lib/optics';
import { stackElementSchema, stackSchema, type Stack, type StackElement, type StackElementKind } from '@/lib/schemas/stack';

/** What the editor knows about each kind of element. */
export const ELEMENT_KINDS: readonly { kind: StackElementKind; name: string; help: string }[] = [
  { kind: 'display', name: 'Display', help: 'The light source. Always first.' },
  { kind: 'plate-beam-splitter', name: 'Plate beam splitter', help: 'Coated glass plate at an angle; its back face makes the ghost.' },
  { kind: 'combiner', name: 'Combiner', help: 'Partly reflecting surface in front of the eye; curved ones also form the image.' },
  { kind: 'linear-polariser', name: 'Linear polariser', help: 'Polariser film; world-side film dims the world but not the display.' },
  { kind: 'neutral-filter', name: 'Neutral filter', help: 'Neutral density film or tinted visor.' },
  { kind: 'magnifier', name: 'Magnifier', help: 'Relay or magnifier lens, counted by its transmittance.' },
];

export const kindName = (kind: StackElementKind): string => ELEMENT_KINDS.find((k) => k.kind === kind)?.name ?? kind;

/**
 * One element as the form holds it: every value a string, so that a half-typed "0." stays on
 * screen and the schema (not the input) decides what is valid.
 */
export type DraftElement = { key: string; kind: StackElementKind; values: Record<string, string> };

let keySeq = 0;
const nextKey = () => `el-${Date.now().toString(36)}-${(keySeq++).toString(36)}`;

const str = (v: number | undefined): string => (v === undefined ? '' : String(v));

/** A stored or template element as form values. Pass a fixed key for server-rendered elements (stable ids). */
export function toDraft(e: StackElement, key: string = nextKey()): DraftElement {
  const base = { key, kind: e.kind };
  const label = e.label ?? '';
  switch (e.kind) {
    case 'display':
      return {
        ...base,
        values: {
          label,
          luminance: str(e.luminance),
          polKind: e.polarisation.kind,
          polAngle: e.polarisation.kind === 'linear' ? str(e.polarisation.angleDeg) : '0',
          resWidth: str(e.resolution?.width),
          resHeight: str(e.resolution?.height),
          whiteX: str(e.white?.x),
          whiteY: str(e.white?.y),
        },
      };
    case 'plate-beam-splitter':
      return {
        ...base,
        values: {
          label,
          R: str(e.R),
          T: str(e.T),
          angleDeg: str(e.angleDeg),
          n: str(e.n),
          backKind: e.back.kind,
          backR: e.back.kind === 'ar' ? str(e.back.R) : '0.005',
        },
      };
    case 'combiner':
      return { ...base, values: { label, shape: e.shape, R: str(e.R), T: str(e.T) } };
    case 'linear-polariser':
      return { ...base, values: { label, T1: str(e.T1), T2: str(e.T2), axisDeg: str(e.axisDeg), worldOnly: e.worldOnly ? 'true' : 'false' } };
    case 'neutral-filter':
      return { ...base, values: { label, T: str(e.T), worldOnly: e.worldOnly ? 'true' : 'false' } };
    case 'magnifier':
      return { ...base, values: { label, T: str(e.T) } };
  }
}

/** Plausible starting values for a newly added element (placeholders, not data of any part). */
export function newElement(kind: StackElementKind): DraftElement {
  const defaults: Record<StackElementKind, StackElement> = {
    display: { kind: 'display', luminance: 1000, polarisation: { kind: 'none' } },
    'plate-beam-splitter': { kind: 'plate-beam-splitter', R: 0.5, T: 0.48, angleDeg: 45, n: 1.52, back: { kind: 'uncoated' } },
    combiner: { kind: 'combiner', shape: 'curved', R: 0.5, T: 0.47 },
    'linear-polariser': { kind: 'linear-polariser', T1: 0.88, T2: 0.001, axisDeg: 90, worldOnly: true },
    'neutral-filter': { kind: 'neutral-filter', T: 0.5, worldOnly: true },
    magnifier: { kind: 'magnifier', T: 0.92 },
  };
  return toDraft(defaults[kind]);
}

const blank = (s: string | undefined): boolean => s === undefined || s.trim() === '';

// An empty box is "not a number" for the schema, not zero.
const num = (s: string | undefined): number => (s === undefined || s.trim() === '' ? Number.NaN : Number(s));

/** Form values back to a plain element object, unvalidated. */
export function fromDraft(d: DraftElement): Record<string, unknown> {
  const v = d.values;
  const label = v.label?.trim() ? v.label.trim() : undefined;
  switch (d.kind) {
    case 'display':
      return {
        kind: 'display',
        label,
        luminance: num(v.luminance),
        polarisation: v.polKind === 'linear' ? { kind: 'linear', angleDeg: num(v.polAngle) } : { kind: 'none' },
        // optional pairs: both boxes empty leaves the field out; one empty is "not a number" for the schema
        resolution: blank(v.resWidth) && blank(v.resHeight) ? undefined : { width: num(v.resWidth), height: num(v.resHeight) },
        white: blank(v.whiteX) && blank(v.whiteY) ? undefined : { x: num(v.whiteX), y: num(v.whiteY) },
      };
    case 'plate-beam-splitter':
      return {
        kind: 'plate-beam-splitter',
        label,
        R: num(v.R),
        T: num(v.T),
        angleDeg: num(v.angleDeg),
        n: num(v.n),
        back: v.backKind === 'ar' ? { kind: 'ar', R: num(v.backR) } : { kind: 'uncoated' },
      };
    case 'combiner':
      return { kind: 'combiner', label, shape: v.shape, R: num(v.R), T: num(v.T) };
    case 'linear-polariser':
      return { kind: 'linear-polariser', label, T1: num(v.T1), T2: num(v.T2), axisDeg: num(v.axisDeg), worldOnly: v.worldOnly === 'true' };
    case 'neutral-filter':
      return { kind: 'neutral-filter', label, T: num(v.T), worldOnly: v.worldOnly === 'true' };
    case 'magnifier':
      return { kind: 'magnifier', label, T: num(v.T) };
  }
}

/** Form value name → the schema path below the element it is checked at. */
export const FIELD_PATH: Record<string, string> = { backR: 'back.R', polAngle: 'polarisation.angleDeg', resWidth: 'resolution.width', resHeight: 'resolution.height', whiteX: 'white.x', whiteY: 'white.y' };

/** Errors keyed "i.path" for a field of element i, "i" for the element, "_stack" for the whole stack. */
export type StackErrors = Record<string, string[]>;

/** Maps the server's field-error keys ("elements.1.T") onto the editor's ("1.T"). */
export function serverErrorsToStackErrors(fieldErrors: Record<string, string[]> | undefined): StackErrors {
  const out: StackErrors = {};
  for (const [key, messages] of Object.entries(fieldErrors ?? {})) {
    const k = key.startsWith('elements.') ? key.slice('elements.'.length) : '_stack';
    (out[k] ??= []).push(...messages);
  }
  return out;
}

/** Validates the form with the same schema the server uses. */
export function validateDrafts(drafts: DraftElement[]): { stack: Stack | null; errors: StackErrors } {
  const parsed = stackSchema.safeParse({ elements: drafts.map(fromDraft) });
  if (parsed.success) return { stack: parsed.data, errors: {} };
  const errors: StackErrors = {};
  for (const issue of parsed.error.issues) {
    const [head, index, ...rest] = issue.path;
    const key = head === 'elements' && typeof index === 'number' ? [index, ...rest].join('.') : '_stack';
    const list = (errors[key] ??= []);
    if (!list.includes(issue.message)) list.push(issue.message);
  }
  return { stack: null, errors };
}

/** Loads whatever can be used of a stored stack: a valid stack whole, otherwise its valid elements. */
export function storedElements(raw: unknown): { elements: StackElement[]; complete: boolean } {
  const whole = stackSchema.safeParse(raw);
  if (whole.success) return { elements: whole.data.elements, complete: true };
  const list = (raw as { elements?: unknown } | null)?.elements;
  if (!Array.isArray(list)) return { elements: [], complete: false };
  const elements = list.flatMap((e) => {
    const one = stackElementSchema.safeParse(e);
    return one.success ? [one.data] : [];
  });
  return { elements, complete: false };
}

/** Slider overrides; null leaves the stack's own value. */
export type WhatIf = {
  splitterR: number | null;
  combinerR: number | null;
  displayLuminance: number | null;
  polariser: boolean | null;
};

export const NO_WHAT_IF: WhatIf = { splitterR: null, combinerR: null, displayLuminance: null, polariser: null };

export const isWhatIfActive = (w: WhatIf): boolean =>
  w.splitterR !== null || w.combinerR !== null || w.displayLuminance !== null || w.polariser !== null;

const round6 = (x: number) => Math.round(x * 1e6) / 1e6;

// A coating's absorption does not change much when its split is retuned, so T follows R with
// the loss (1 − R − T) held.
function retune(R: number, T: number, newR: number): { R: number; T: number } {
  const loss = Math.max(0, 1 - R - T);
  return { R: round6(newR), T: round6(Math.max(0, 1 - newR - loss)) };
}

/** A stand-in world-side polariser for "what if we add one". */
export const WHAT_IF_POLARISER: StackElement = {
  kind: 'linear-polariser',
  label: 'What-if polariser',
  T1: 0.88,
  T2: 0.001,
  axisDeg: 90,
  worldOnly: true,
};

export const hasPolariser = (s: Stack): boolean => s.elements.some((e) => e.kind === 'linear-polariser');

/** The stack with the sliders' values put in. The input is not changed. */
export function applyWhatIf(stack: Stack, w: WhatIf): Stack {
  let elements: StackElement[] = stack.elements.map((e) => {
    if (e.kind === 'plate-beam-splitter' && w.splitterR !== null) return { ...e, ...retune(e.R, e.T, w.splitterR) };
    if (e.kind === 'combiner' && w.combinerR !== null) return { ...e, ...retune(e.R, e.T, w.combinerR) };
    if (e.kind === 'display' && w.displayLuminance !== null) return { ...e, luminance: Math.round(w.displayLuminance) };
    return e;
  });
  if (w.polariser === false) elements = elements.filter((e) => e.kind !== 'linear-polariser');
  if (w.polariser === true && !elements.some((e) => e.kind === 'linear-polariser')) elements = [...elements, WHAT_IF_POLARISER];
  return { elements };
}

/** The prediction, or null if the physics refuses the stack (the schema should have caught it). */
export function safePredict(stack: Stack | null): StackPrediction | null {
  if (!stack) return null;
  try {
    return predictStack(stack);
  } catch {
    return null;
  }
}

/** Median of the finite values, or null when there are none. */
export function median(values: readonly number[]): number | null {
  const v = values.filter(Number.isFinite).sort((a, b) => a - b);
  if (v.length === 0) return null;
  const mid = Math.floor(v.length / 2);
  return v.length % 2 ? (v[mid] ?? null) : ((v[mid - 1] ?? 0) + (v[mid] ?? 0)) / 2;
}

/** Mean of the finite values, or null when there are none. */
export function mean(values: readonly number[]): number | null {
  const v = values.filter(Number.isFinite);
  if (v.length === 0) return null;
  let sum = 0;
  for (const x of v) sum += x;
  return sum / v.length;
}

/** A measured reading as the planner shows it (plain data, from server to browser). */
export type MeasuredPoint = {
  captureSetId: string;
  variant: string;
  backgroundCdm2: number | null;
  /** The background from the photos (camera profile or rough EXIF estimate), when they have an absolute scale. */
  photoBackground?: { cdm2: number; kind: 'calibrated' | 'rough-estimate' } | null;
  ambientContrastRatio: number | null;
  ghostRatio: number | null;
  transmission: number | null;
  /** How the orientation marker arrived at the camera (capture sets of pattern orientation). */
  orientation?: { orientation: 'normal' | 'mirrored' | 'upside-down-mirrored' | 'rotated-180'; mirrored: boolean; margin: number } | null;
};
