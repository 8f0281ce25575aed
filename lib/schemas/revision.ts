import { z } from 'zod';
import { isoDateSchema, safe, strictNumber } from './common';

export const REVISION_STATUSES = ['planned', 'built', 'measured', 'retired'] as const;

// Forms send '' for an untouched optional input; treat it as "not given".
const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
// blank or null is "not given" for the order too
const blankOrNullToUndefined = (v: unknown) => (v === null ? undefined : blankToUndefined(v));

export const revisionSchema = z.object({
  label: safe(
    z
      .string({ message: 'Enter a label' })
      .trim()
      .min(1, { message: 'Enter a label' })
      .max(80, { message: 'Use at most 80 characters' }),
  ),
  // a date that exists: 2026-02-30 is a field error, not a row PostgreSQL refuses
  builtOn: z.preprocess(blankToUndefined, isoDateSchema().nullable().optional()),
  position: z.preprocess(
    blankOrNullToUndefined,
    strictNumber('Order must be a whole number', (n) => n.int({ message: 'Order must be a whole number' }).min(1, { message: 'Order starts at 1' }).max(10_000, { message: 'Order is at most 10000' })).optional(),
  ),
  notes: safe(z.string().trim().max(4000, { message: 'Use at most 4000 characters' }), { multiline: true }).default(''),
  status: z.enum(REVISION_STATUSES, { message: 'Pick a status' }).default('planned'),
});

export const revisionCreateSchema = revisionSchema;
export const revisionUpdateSchema = revisionSchema.partial();
export type RevisionInput = z.infer<typeof revisionSchema>;
