import { z } from 'zod';
import { optionalStrictNumber, safe } from './common';

export const CAPTURE_PATTERNS = ['full', 'checkerboard'] as const;

// blank or null is "not known" (never 0); "0x10" or "1_000" is not a number a person typed
const optionalNumber = (label: string, max: number) =>
  optionalStrictNumber(`${label} must be a number`, (n) =>
    n.min(0, { message: `${label} cannot be negative` }).max(max, { message: `${label} above ${max} is not plausible` }),
  );

/** What the tester knows about the shot's lighting; every field is optional. */
export const conditionsSchema = z.object({
  ambientLux: optionalNumber('Ambient illuminance', 200_000),
  backgroundCdm2: optionalNumber('Background luminance', 100_000),
  displayLevel: safe(z.string().trim().max(80, { message: 'Use at most 80 characters' })).default(''),
});

// Flat fields so one schema serves both HTML forms and JSON bodies.
export const captureSetSchema = z.object({
  label: safe(z.string({ message: 'Enter a label' }).trim().min(1, { message: 'Enter a label' }).max(120, { message: 'Use at most 120 characters' })),
  variant: safe(z.string().trim().max(80, { message: 'Use at most 80 characters' })).default(''),
  pattern: z.enum(CAPTURE_PATTERNS, { message: 'Pick the pattern shown on the display' }).default('full'),
  notes: safe(z.string().trim().max(4000, { message: 'Use at most 4000 characters' }), { multiline: true }).default(''),
  ...conditionsSchema.shape,
});

export const captureSetCreateSchema = captureSetSchema;
export const captureSetUpdateSchema = captureSetSchema.partial();
export type CaptureSetInput = z.infer<typeof captureSetSchema>;
export type Conditions = z.infer<typeof conditionsSchema>;
