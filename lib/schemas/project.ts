import { z } from 'zod';

export const projectSchema = z.object({
  name: z
    .string({ message: 'Enter a name' })
    .trim()
    .min(1, { message: 'Enter a name' })
    .max(120, { message: 'Use at most 120 characters' }),
  description: z.string().trim().max(2000, { message: 'Use at most 2000 characters' }).default(''),
});

export const projectCreateSchema = projectSchema;
export const projectRenameSchema = projectSchema.pick({ name: true });
export const projectUpdateSchema = projectSchema.partial();

export type ProjectInput = z.infer<typeof projectSchema>;
