import { z } from 'zod';
import { safe } from './common';

/** A webhook as a lab admin registers it: the receiving address and the events it wants. */
export const webhookCreateSchema = z
  .object({
    url: safe(z.string({ message: 'Give the receiving address' }).trim().min(1, { message: 'Give the receiving address' }).max(500, { message: 'Use at most 500 characters' })),
    eventDone: z.literal('on').optional(),
    eventFailed: z.literal('on').optional(),
    eventTarget: z.literal('on').optional(),
  })
  .refine((v) => v.eventDone || v.eventFailed || v.eventTarget, { message: 'Choose at least one event', path: ['events'] });
