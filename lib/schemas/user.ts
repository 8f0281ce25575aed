import { z } from 'zod';
import { safe } from './common';

export const emailSchema = z
  .string({ message: 'Enter an e-mail address' })
  .trim()
  .toLowerCase()
  .max(254, { message: 'That address is too long' })
  .email({ message: 'Enter a valid e-mail address' });

export const passwordSchema = z
  .string({ message: 'Enter a password' })
  .min(10, { message: 'Use at least 10 characters' })
  .max(200, { message: 'Use at most 200 characters' });

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, { message: 'Enter your password' }).max(200),
});

export const signUpSchema = z.object({
  name: safe(z.string().trim().min(1, { message: 'Enter your name' }).max(120, { message: 'Use at most 120 characters' })),
  email: emailSchema,
  password: passwordSchema,
  labName: safe(z.string().trim().min(2, { message: 'Name your lab (2 characters or more)' }).max(120, { message: 'Use at most 120 characters' })),
});
