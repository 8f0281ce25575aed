import { z } from 'zod';
import { passwordProblems } from '../auth/password-rules';
import { safe } from './common';

export const emailSchema = z
  .string({ message: 'Enter an e-mail address' })
  .trim()
  .toLowerCase()
  .max(254, { message: 'That address is too long' })
  .email({ message: 'Enter a valid e-mail address' });

// 10 characters to 72 bytes, not a common password or pattern (lib/auth/password-rules.ts)
export const passwordSchema = z.string({ message: 'Enter a password' }).superRefine((value, ctx) => {
  for (const message of passwordProblems(value)) ctx.addIssue({ code: 'custom', message });
});

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, { message: 'Enter your password' }).max(200),
});

export const signUpSchema = z.object({
  name: safe(z.string().trim().min(1, { message: 'Enter your name' }).max(120, { message: 'Use at most 120 characters' })),
  email: emailSchema,
  password: passwordSchema,
  labName: safe(z.string().trim().min(2, { message: 'Name your lab (2 characters or more)' }).max(120, { message: 'Use at most 120 characters' })),
}).superRefine((v, ctx) => {
  // the rules that need the rest of the form: not the e-mail address or the name
  const [problem] = passwordProblems(v.password, { email: v.email, name: v.name });
  if (problem && !passwordProblems(v.password).includes(problem)) ctx.addIssue({ code: 'custom', path: ['password'], message: problem });
});
