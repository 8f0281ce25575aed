import { z } from 'zod';
import { METRIC_KEYS } from '../targets/metrics';

// Flat fields so one schema serves the HTML forms and JSON bodies alike.
export const targetSchema = z.object({
  metric: z.enum(METRIC_KEYS, { message: 'Pick a metric' }),
  comparator: z.enum(['>=', '<='], { message: 'Pick at least or at most' }),
  value: z.preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? undefined : v),
    z.coerce
      .number({ message: 'Enter a number' })
      .refine(Number.isFinite, { message: 'Enter a number' })
      .min(0, { message: 'A target cannot be negative' })
      .max(1_000_000, { message: 'Above 1,000,000 is not plausible' }),
  ),
  conditionNote: z.string().trim().max(300, { message: 'Use at most 300 characters' }).default(''),
  isDefault: z.preprocess((v) => v === true || v === 'true' || v === 'on', z.boolean()).default(false),
});

export const targetCreateSchema = targetSchema;
export const targetUpdateSchema = targetSchema.partial();
export type TargetInput = z.infer<typeof targetSchema>;

/** ?metric= of the trend answer: absent for every metric, or one metric's key. */
export const trendMetricSchema = z.enum(METRIC_KEYS, { message: `Use one of: ${METRIC_KEYS.join(', ')}` }).nullable();
