import { z } from 'zod';
import { safe } from './common';

// Rounding slack so that R 0.3 + T 0.7 typed in a form is not refused for 1.0000000000000002.
const SUM_SLACK = 1e-9;

const fraction = (what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .refine(Number.isFinite, { message: `${what} must be a finite number` })
    .refine((v) => v >= 0 && v <= 1, { message: `${what} must be between 0 and 1 (a fraction, not a percentage)` });

const angle = (what: string, min: number, max: number) =>
  z
    .number({ error: `${what} must be a number` })
    .refine(Number.isFinite, { message: `${what} must be a finite number` })
    .refine((v) => v >= min && v <= max, { message: `${what} must be between ${min}° and ${max}°` });

const label = safe(z.string().trim().max(80, { message: 'The label must be at most 80 characters' })).optional();

const rPlusTAtMostOne = (v: { R: number; T: number }) => v.R + v.T <= 1 + SUM_SLACK;
const rPlusTMessage = {
  message: 'R + T must not exceed 1: a part cannot reflect and transmit more light than it receives',
  path: ['T'],
};

/** Display polarisation: unpolarised, or linear at an angle in the viewer's frame. */
export const displayPolarisationSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('none') }),
  z.object({ kind: z.literal('linear'), angleDeg: angle('The polarisation angle', -180, 180) }),
]);

const displayPixels = (what: string) =>
  z
    .number({ error: `The display ${what} must be a number of pixels` })
    .refine((v) => Number.isInteger(v) && v >= 1 && v <= 100_000, { message: `The display ${what} must be a whole number of pixels from 1 to 100000` });

const chromaticityCoordinate = (what: string) =>
  z
    .number({ error: `The white point ${what} must be a number` })
    .refine((v) => Number.isFinite(v) && v > 0 && v < 1, { message: `The white point ${what} must be between 0 and 1 (CIE 1931 chromaticity)` });

/** The light source: a small display of known luminance. */
export const displayElementSchema = z.object({
  kind: z.literal('display'),
  label,
  luminance: z
    .number({ error: 'The display luminance must be a number' })
    .refine(Number.isFinite, { message: 'The display luminance must be a finite number' })
    .refine((v) => v > 0, { message: 'The display luminance must be greater than 0 cd/m²' }),
  polarisation: displayPolarisationSchema,
  /** Native resolution in pixels: the field of view then gives pixels per degree (docs/method.md §5.11). */
  resolution: z.object({ width: displayPixels('width'), height: displayPixels('height') }).optional(),
  /** The display's own white, CIE 1931 x, y: the display colour's Δu′v′ is measured from it (D65 otherwise). */
  white: z
    .object({ x: chromaticityCoordinate('x'), y: chromaticityCoordinate('y') })
    .refine((w) => w.x + w.y < 1, { message: 'x + y of the white point must be below 1', path: ['y'] })
    .optional(),
});

/** Back face of a plate beam splitter. */
export const plateBackSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('uncoated') }),
  z.object({ kind: z.literal('ar'), R: fraction('The AR residual reflectance') }),
]);

/** A coated glass plate at an angle: reflects the display, transmits the world. */
export const plateBeamSplitterElementSchema = z
  .object({
    kind: z.literal('plate-beam-splitter'),
    label,
    R: fraction('The splitter reflectance R'),
    T: fraction('The splitter transmittance T'),
    angleDeg: angle('The splitter angle', 0, 89),
    n: z
      .number({ error: 'The substrate index must be a number' })
      .refine((v) => Number.isFinite(v) && v >= 1 && v <= 2.5, {
        message: 'The substrate index n must be between 1.0 and 2.5',
      }),
    back: plateBackSchema,
  })
  .refine(rPlusTAtMostOne, rPlusTMessage);

/** A partially reflecting combiner, flat or curved (curved ones also form the image). */
export const combinerElementSchema = z
  .object({
    kind: z.literal('combiner'),
    label,
    shape: z.enum(['flat', 'curved'], { error: 'The combiner shape must be flat or curved' }),
    R: fraction('The combiner reflectance R'),
    T: fraction('The combiner transmittance T'),
  })
  .refine(rPlusTAtMostOne, rPlusTMessage);

/** A linear polariser sheet. worldOnly: mounted outside the combiner, crossed by the world's light alone. */
export const linearPolariserElementSchema = z
  .object({
    kind: z.literal('linear-polariser'),
    label,
    T1: fraction('The transmittance along the axis T1'),
    T2: fraction('The transmittance across the axis T2'),
    axisDeg: angle('The polariser axis', -180, 180),
    worldOnly: z.boolean().optional(),
  })
  .refine((v) => v.T2 <= v.T1, {
    message: 'T2 (across the axis) must not exceed T1 (along the axis)',
    path: ['T2'],
  });

/** A neutral density filter or tinted visor. worldOnly: crossed by the world's light alone. */
export const neutralFilterElementSchema = z.object({
  kind: z.literal('neutral-filter'),
  label,
  T: fraction('The filter transmittance T'),
  worldOnly: z.boolean().optional(),
});

/** A magnifier or relay lens, modelled by its transmittance. */
export const magnifierElementSchema = z.object({
  kind: z.literal('magnifier'),
  label,
  T: fraction('The magnifier transmittance T'),
});

/** Any element of a stack. */
export const stackElementSchema = z.discriminatedUnion('kind', [
  displayElementSchema,
  plateBeamSplitterElementSchema,
  combinerElementSchema,
  linearPolariserElementSchema,
  neutralFilterElementSchema,
  magnifierElementSchema,
]);

/**
 * An optical stack: the elements in the order the display's light meets them, from the display
 * to the eye. In a birdbath the splitter is listed once, before the combiner; its second pass
 * (transmission on the way back) is implied.
 */
export const stackSchema = z
  .object({
    elements: z
      .array(stackElementSchema)
      .min(2, { message: 'A stack needs at least a display and one reflecting element' })
      .max(32, { message: 'A stack may have at most 32 elements' }),
  })
  .superRefine((stack, ctx) => {
    const displays = stack.elements.filter((e) => e.kind === 'display').length;
    if (displays !== 1) {
      ctx.addIssue({
        code: 'custom',
        message: `A stack must have exactly one display (found ${displays})`,
        path: ['elements'],
      });
    } else if (stack.elements[0]?.kind !== 'display') {
      ctx.addIssue({ code: 'custom', message: 'The display must be the first element', path: ['elements', 0] });
    }
    const splitters = stack.elements.filter((e) => e.kind === 'plate-beam-splitter').length;
    const combiners = stack.elements.filter((e) => e.kind === 'combiner').length;
    if (splitters + combiners === 0) {
      ctx.addIssue({
        code: 'custom',
        message: 'A stack needs a plate beam splitter or a combiner to bring the display into view',
        path: ['elements'],
      });
    } else if (splitters > 1 || combiners > 1) {
      ctx.addIssue({
        code: 'custom',
        message:
          'Supported layouts are one reflecting element (single combiner) or a splitter followed by a combiner (birdbath)',
        path: ['elements'],
      });
    } else if (splitters === 1 && combiners === 1) {
      const iSplit = stack.elements.findIndex((e) => e.kind === 'plate-beam-splitter');
      const iComb = stack.elements.findIndex((e) => e.kind === 'combiner');
      if (iComb < iSplit) {
        ctx.addIssue({
          code: 'custom',
          message: 'In a birdbath the splitter comes before the combiner: list elements in the order the display light meets them',
          path: ['elements', iComb],
        });
      }
    }
  });

export type DisplayPolarisation = z.infer<typeof displayPolarisationSchema>;
export type DisplayElement = z.infer<typeof displayElementSchema>;
export type PlateBack = z.infer<typeof plateBackSchema>;
export type PlateBeamSplitterElement = z.infer<typeof plateBeamSplitterElementSchema>;
export type CombinerElement = z.infer<typeof combinerElementSchema>;
export type LinearPolariserElement = z.infer<typeof linearPolariserElementSchema>;
export type NeutralFilterElement = z.infer<typeof neutralFilterElementSchema>;
export type MagnifierElement = z.infer<typeof magnifierElementSchema>;
export type StackElement = z.infer<typeof stackElementSchema>;
export type Stack = z.infer<typeof stackSchema>;
export type StackElementKind = StackElement['kind'];

/**
 * A variant's stack as a change to the base stack: the base elements it leaves out (their
 * positions, from 0) and the elements it adds after them (e.g. "with polarizer" adds a polariser).
 */
export const variantChangeSchema = z.object({
  without: z.array(z.number().int().min(0).max(31)).max(32, { message: 'A variant may leave out at most 32 elements' }).default([]),
  add: z.array(stackElementSchema).max(8, { message: 'A variant may add at most 8 elements' }).default([]),
});

/** Every variant's change, keyed by the variant's label as the capture sets carry it. */
export const variantStacksSchema = z
  .record(z.string().trim().min(1, { message: 'A variant needs a name' }).max(80, { message: 'A variant name has at most 80 characters' }), variantChangeSchema)
  .refine((r) => Object.keys(r).length <= 20, { message: 'At most 20 variants per revision' });

export type VariantChange = z.infer<typeof variantChangeSchema>;
export type VariantStacks = z.infer<typeof variantStacksSchema>;

/**
 * What the analysis takes from a stored stack's display element (raw JSON, validated here): its
 * resolution and white point, each null when absent or not valid.
 */
export function displayOpticsOf(stack: unknown): { displayResolution: { width: number; height: number } | null; displayWhite: { x: number; y: number } | null } {
  const elements = stack && typeof stack === 'object' && Array.isArray((stack as { elements?: unknown }).elements) ? ((stack as { elements: unknown[] }).elements) : [];
  const raw = elements.find((e) => e && typeof e === 'object' && (e as { kind?: unknown }).kind === 'display');
  const parsed = displayElementSchema.safeParse(raw);
  if (!parsed.success) return { displayResolution: null, displayWhite: null };
  return { displayResolution: parsed.data.resolution ?? null, displayWhite: parsed.data.white ?? null };
}
