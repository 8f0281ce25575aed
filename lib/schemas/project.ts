import { z } from 'zod';
import { safe } from './common';

export const projectSchema = z.object({
  name: safe(
    z
      .string({ message: 'Enter a name' })
      .trim()
      .min(1, { message: 'Enter a name' })
      .max(120, { message: 'Use at most 120 characters' }),
  ),
  description: safe(z.string().trim().max(2000, { message: 'Use at most 2000 characters' }), { multiline: true }).default(''),
});

export const projectCreateSchema = projectSchema;
export const projectRenameSchema = projectSchema.pick({ name: true });
export const projectUpdateSchema = projectSchema.partial();

export type ProjectInput = z.infer<typeof projectSchema>;
