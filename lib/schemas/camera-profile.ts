import { z } from 'zod';
import { DEGREES_PER_PIXEL_BOUNDS } from '../photometry/geometry';
import { optionalStrictNumber, safe, strictNumber } from './common';
import { rectSchema } from './region';

const text = (what: string, max: number) => safe(z.string({ message: `Give the ${what}` }).trim().min(1, { message: `Give the ${what}` }).max(max, { message: `Use at most ${max} characters` }));
// multipart fields arrive as text: read strictly as numbers ("0x10" is not 16), with a message a person can act on
const pixels = <T extends z.ZodType>(what: string, range: (n: z.ZodNumber) => T) => strictNumber(`${what} is a number of pixels`, (n) => range(n.int({ message: `${what} is a whole number of pixels` })));

/** The fields of a calibration upload besides the photo itself. */
export const calibrationFormSchema = z.object({
  name: safe(z.string().trim().max(80, { message: 'Use at most 80 characters' })).optional().default(''),
  meterCdm2: strictNumber('Enter the spot meter’s reading in cd/m²', (n) =>
    n.positive({ message: 'The meter reading must be above 0 cd/m²' }).max(1e9, { message: 'That reading is beyond any luminance meter' }),
  ),
  x: pixels('The patch’s left edge', (n) => n.min(0, { message: 'The patch starts left of the photo' })),
  y: pixels('The patch’s top edge', (n) => n.min(0, { message: 'The patch starts above the photo' })),
  w: pixels('The patch’s width', (n) => n.min(1, { message: 'Mark a patch at least 1 px wide' })),
  h: pixels('The patch’s height', (n) => n.min(1, { message: 'Mark a patch at least 1 px high' })),
  // for photos whose EXIF lacks them; EXIF wins when it has them
  make: safe(z.string().trim().max(80, { message: 'Use at most 80 characters' })).optional().default(''),
  model: safe(z.string().trim().max(80, { message: 'Use at most 80 characters' })).optional().default(''),
});
export type CalibrationForm = z.infer<typeof calibrationFormSchema>;

/** The optional pattern rectangle of a linearity check (the whole photo when left out). */
export const linearityFormSchema = z.object({
  x: pixels('The pattern’s left edge', (n) => n.min(0, { message: 'The pattern starts left of the photo' })).optional(),
  y: pixels('The pattern’s top edge', (n) => n.min(0, { message: 'The pattern starts above the photo' })).optional(),
  w: pixels('The pattern’s width', (n) => n.min(1, { message: 'Mark a pattern at least 1 px wide' })).optional(),
  h: pixels('The pattern’s height', (n) => n.min(1, { message: 'Mark a pattern at least 1 px high' })).optional(),
});

/** What a profile keeps about the shot it was calibrated from. */
export const calibrationDetailsSchema = z.object({
  patch: rectSchema,
  meterCdm2: z.number().positive(),
  meanY: z.number().positive(),
  exposure: z.object({ exposureTime: z.number().positive(), fNumber: z.number().positive(), iso: z.number().positive(), factor: z.number().positive() }),
  photoName: z.string(),
  imageWidth: z.number().int().positive(),
  imageHeight: z.number().int().positive(),
});
export type CalibrationDetails = z.infer<typeof calibrationDetailsSchema>;

export const linearityDetailsSchema = z.object({
  exponent: z.number(),
  maxDeviation: z.number(),
  linear: z.boolean(),
  warning: z.string().nullable(),
  levels: z.array(z.number().nullable()),
  expected: z.array(z.number()),
  checkedAt: z.string(),
});
export type LinearityDetails = z.infer<typeof linearityDetailsSchema>;

/**
 * The angle one camera pixel spans, measured on a target of known angle (a blank field clears it):
 * the field of view then comes from it instead of the EXIF focal length (docs/method.md §5.11).
 */
export const degreesPerPixelSchema = z.object({
  degreesPerPixel: optionalStrictNumber('Enter the angle per pixel in degrees, e.g. 0.0125', (n) =>
    n
      .min(DEGREES_PER_PIXEL_BOUNDS[0], { message: `At least ${DEGREES_PER_PIXEL_BOUNDS[0]}° per pixel: a smaller angle is beyond any camera lens` })
      .max(DEGREES_PER_PIXEL_BOUNDS[1], { message: `At most ${DEGREES_PER_PIXEL_BOUNDS[1]}° per pixel: a larger angle is beyond any camera lens` }),
  ),
});

export const cameraIdentitySchema = z.object({ make: text('camera make', 80), model: text('camera model', 80) });
