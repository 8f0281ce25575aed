import { z } from 'zod';
import { rectSchema } from './region';

const text = (what: string, max: number) => z.string({ message: `Give the ${what}` }).trim().min(1, { message: `Give the ${what}` }).max(max, { message: `Use at most ${max} characters` });
// multipart fields arrive as text: numbers are coerced, with a message a person can act on
const pixels = (what: string) => z.coerce.number({ message: `${what} is a number of pixels` }).int({ message: `${what} is a whole number of pixels` });

/** The fields of a calibration upload besides the photo itself. */
export const calibrationFormSchema = z.object({
  name: z.string().trim().max(80, { message: 'Use at most 80 characters' }).optional().default(''),
  meterCdm2: z.coerce
    .number({ message: 'Enter the spot meter’s reading in cd/m²' })
    .finite({ message: 'Enter the spot meter’s reading in cd/m²' })
    .positive({ message: 'The meter reading must be above 0 cd/m²' })
    .max(1e9, { message: 'That reading is beyond any luminance meter' }),
  x: pixels('The patch’s left edge').min(0, { message: 'The patch starts left of the photo' }),
  y: pixels('The patch’s top edge').min(0, { message: 'The patch starts above the photo' }),
  w: pixels('The patch’s width').min(1, { message: 'Mark a patch at least 1 px wide' }),
  h: pixels('The patch’s height').min(1, { message: 'Mark a patch at least 1 px high' }),
  // for photos whose EXIF lacks them; EXIF wins when it has them
  make: z.string().trim().max(80).optional().default(''),
  model: z.string().trim().max(80).optional().default(''),
});
export type CalibrationForm = z.infer<typeof calibrationFormSchema>;

/** The optional pattern rectangle of a linearity check (the whole photo when left out). */
export const linearityFormSchema = z.object({
  x: pixels('The pattern’s left edge').min(0).optional(),
  y: pixels('The pattern’s top edge').min(0).optional(),
  w: pixels('The pattern’s width').min(1).optional(),
  h: pixels('The pattern’s height').min(1).optional(),
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

export const cameraIdentitySchema = z.object({ make: text('camera make', 80), model: text('camera model', 80) });
