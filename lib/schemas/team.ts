import { z } from 'zod';
import { ROLES } from '../auth/permissions';
import { safe, uuidSchema } from './common';
import { emailSchema, passwordSchema } from './user';

const roleSchema = z.enum(ROLES, { message: 'Choose a role' });

export const invitationCreateSchema = z.object({ email: emailSchema, role: roleSchema });
export const invitationAcceptSchema = z.object({
  token: z.string().min(10).max(200),
  name: safe(z.string().trim().max(120, { message: 'Use at most 120 characters' })).optional(),
  password: z.string().max(200).optional(),
});
export const newAccountSchema = z.object({ name: safe(z.string().trim().min(1, { message: 'Enter your name' }).max(120, { message: 'Use at most 120 characters' })), password: passwordSchema });

export const memberRoleSchema = z.object({ userId: uuidSchema, role: roleSchema });
export const memberRemoveSchema = z.object({ userId: uuidSchema });
export const idOnlySchema = z.object({ id: uuidSchema });

export const resetRequestSchema = z.object({ email: emailSchema });
export const resetCompleteSchema = z
  .object({ token: z.string().min(10).max(200), password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { message: 'The two passwords differ', path: ['confirm'] });

export const apiTokenCreateSchema = z.object({
  name: safe(z.string().trim().min(1, { message: 'Name the token (e.g. the rig it runs on)' }).max(80, { message: 'Use at most 80 characters' })),
  scopeRead: z.literal('on').optional(),
  scopeCapture: z.literal('on').optional(),
  scopeDelete: z.literal('on').optional(),
  scopeExport: z.literal('on').optional(),
});
