import { z } from 'zod';

export const REVISION_STATUSES = ['planned', 'built', 'measured', 'retired'] as const;

// Forms send '' for an untouched optional input; treat it as "not given".
const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

export const revisionSchema = z.object({
  label: z
    .string({ message: 'Enter a label' })
    .trim()
    .min(1, { message: 'Enter a label' })
    .max(80, { message: 'Use at most 80 characters' }),
  builtOn: z.preprocess(
    blankToUndefined,
    z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'Use a date like 2026-11-02' })
      .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), { message: 'That date does not exist' })
      .nullable()
      .optional(),
  ),
  position: z.preprocess(blankToUndefined, z.coerce.number({ message: 'Order must be a whole number' }).int({ message: 'Order must be a whole number' }).min(1, { message: 'Order starts at 1' }).max(10_000).optional()),
  notes: z.string().trim().max(4000, { message: 'Use at most 4000 characters' }).default(''),
  status: z.enum(REVISION_STATUSES, { message: 'Pick a status' }).default('planned'),
});

export const revisionCreateSchema = revisionSchema;
export const revisionUpdateSchema = revisionSchema.partial();
export type RevisionInput = z.infer<typeof revisionSchema>;
