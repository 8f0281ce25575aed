import { z } from 'zod';
import { CAPTURE_PATTERNS } from './capture-set';
import { METRIC_KEYS } from '../targets/metrics';
import { fromShown } from '../format/metrics';
import { optionalStrictNumber, safe, strictNumber } from './common';

// the patterns a target's figures come from (the orientation marker gives a handedness, nothing to target)
const TARGET_PATTERNS = ['full', 'checkerboard', 'slanted-edge'] as const satisfies readonly (typeof CAPTURE_PATTERNS)[number][];

const blank = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

// read strictly: "0x10" is not 16, and blank or null is "no bound", never 0
const bound = (label: string, max: number) =>
  optionalStrictNumber(`${label} must be a number`, (n) =>
    n.min(0, { message: `${label} cannot be negative` }).max(max, { message: `${label} above ${max.toLocaleString('en-US')} is not plausible` }),
  );

/** Variant names, from a JSON body's array or a form's newline-separated field; trimmed, unique. */
const variantsField = z.preprocess(
  (v) => (typeof v === 'string' ? v.split('\n') : v),
  z
    .array(safe(z.string().trim().max(80, { message: 'A variant name has at most 80 characters' })))
    .max(20, { message: 'Name at most 20 variants' })
    .transform((xs) => [...new Set(xs.filter((x) => x !== ''))]),
);

// Flat fields so one schema serves the HTML forms and JSON bodies alike.
const targetFields = z.object({
  metric: z.enum(METRIC_KEYS, { message: 'Pick a metric' }),
  comparator: z.enum(['>=', '<='], { message: 'Pick at least or at most' }),
  value: z.preprocess(
    (v) => (v === null ? undefined : blank(v)),
    strictNumber('Enter a number', (n) => n.min(0, { message: 'A target cannot be negative' }).max(1_000_000, { message: 'Above 1,000,000 is not plausible' })),
  ),
  /** 'shown': the value is in the unit the screens show (a percentage for ghost and transmission); 'stored' (default): as stored. */
  valueIn: z.enum(['shown', 'stored']).default('stored'),
  conditionNote: safe(z.string().trim().max(300, { message: 'Use at most 300 characters' })).default(''),
  ambientLuxMin: bound('The lowest ambient illuminance', 200_000),
  ambientLuxMax: bound('The highest ambient illuminance', 200_000),
  backgroundCdm2Min: bound('The lowest background luminance', 100_000),
  backgroundCdm2Max: bound('The highest background luminance', 100_000),
  pattern: z.preprocess(blank, z.enum(TARGET_PATTERNS, { message: 'Pick full white, checkerboard or slanted edge' }).optional()),
  variants: variantsField.default([]),
  isDefault: z.preprocess((v) => v === true || v === 'true' || v === 'on', z.boolean()).default(false),
});

type Fields = z.infer<typeof targetFields>;

/** Ranges must run low to high; a percentage above 100 % is refused. */
function checkTarget(v: Fields, ctx: z.RefinementCtx): void {
  for (const [lo, hi, what] of [
    ['ambientLuxMin', 'ambientLuxMax', 'ambient illuminance'],
    ['backgroundCdm2Min', 'backgroundCdm2Max', 'background luminance'],
  ] as const) {
    const a = v[lo];
    const b = v[hi];
    if (a !== undefined && b !== undefined && a > b) ctx.addIssue({ code: 'custom', path: [hi], message: `The highest ${what} must not be below the lowest` });
  }
  if ((v.metric === 'ghostRatio' || v.metric === 'transmission') && v.valueIn === 'shown' && v.value > 100) {
    ctx.addIssue({ code: 'custom', path: ['value'], message: 'A percentage cannot exceed 100 %' });
  }
}

/** The stored form: the value as stored, the condition gathered. */
function toWrite<T extends Fields>(v: T) {
  const { valueIn, ambientLuxMin, ambientLuxMax, backgroundCdm2Min, backgroundCdm2Max, pattern, ...rest } = v;
  const condition = Object.fromEntries(Object.entries({ ambientLuxMin, ambientLuxMax, backgroundCdm2Min, backgroundCdm2Max, pattern }).filter(([, x]) => x !== undefined));
  return { ...rest, value: valueIn === 'shown' ? fromShown(v.metric, v.value) : v.value, condition };
}

/** A target: the schema's object, so actions can extend it with their ids, then `toTargetWrite`. */
export const targetSchema = targetFields;
export const targetCreateSchema = targetFields.superRefine(checkTarget).transform(toWrite);
export const targetUpdateSchema = targetFields.partial();
export type TargetInput = z.infer<typeof targetFields>;

/** Checks and gathers what a form or body sent, after `targetSchema.extend(...)` parsed it. */
export function toTargetWrite<T extends Fields>(v: T, ctx?: z.RefinementCtx) {
  if (ctx) checkTarget(v, ctx);
  return toWrite(v);
}

/** The same checks for an extended schema: `targetSchema.extend({...}).superRefine(refineTarget)`. */
export const refineTarget = checkTarget;

/** ?metric= of the trend answer: absent for every metric, or one metric's key. */
export const trendMetricSchema = z.enum(METRIC_KEYS, { message: `Use one of: ${METRIC_KEYS.join(', ')}` }).nullable();
