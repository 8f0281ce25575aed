import { z } from 'zod';

export const CAPTURE_PATTERNS = ['full', 'checkerboard'] as const;

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const optionalNumber = (label: string, max: number) =>
  z.preprocess(
    blankToUndefined,
    z.coerce
      .number({ message: `${label} must be a number` })
      .refine(Number.isFinite, { message: `${label} must be a number` })
      .min(0, { message: `${label} cannot be negative` })
      .max(max, { message: `${label} above ${max} is not plausible` })
      .optional(),
  );

/** What the tester knows about the shot's lighting; every field is optional. */
export const conditionsSchema = z.object({
  ambientLux: optionalNumber('Ambient illuminance', 200_000),
  backgroundCdm2: optionalNumber('Background luminance', 100_000),
  displayLevel: z.string().trim().max(80, { message: 'Use at most 80 characters' }).default(''),
});

// Flat fields so one schema serves both HTML forms and JSON bodies.
export const captureSetSchema = z.object({
  label: z.string({ message: 'Enter a label' }).trim().min(1, { message: 'Enter a label' }).max(120, { message: 'Use at most 120 characters' }),
  variant: z.string().trim().max(80, { message: 'Use at most 80 characters' }).default(''),
  pattern: z.enum(CAPTURE_PATTERNS, { message: 'Pick the pattern shown on the display' }).default('full'),
  notes: z.string().trim().max(4000, { message: 'Use at most 4000 characters' }).default(''),
  ...conditionsSchema.shape,
});

export const captureSetCreateSchema = captureSetSchema;
export const captureSetUpdateSchema = captureSetSchema.partial();
export type CaptureSetInput = z.infer<typeof captureSetSchema>;
export type Conditions = z.infer<typeof conditionsSchema>;
