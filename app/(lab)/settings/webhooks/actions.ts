'use server';

import { revalidatePath } from 'next/cache';
import { createWebhook, deleteWebhook, type WebhookEvent } from '@/db/queries/webhooks';
import { formAction } from '@/lib/server/auth/action';
import { getEnv } from '@/lib/env';
import { AppError, notFound } from '@/lib/errors';
import { idOnlySchema } from '@/lib/schemas/team';
import { webhookCreateSchema } from '@/lib/schemas/webhook';
import { newSecret } from '@/lib/security/tokens';
import { webhooksMayReachPrivate } from '@/lib/server/webhooks/runner';
import { checkWebhookUrl } from '@/lib/webhooks/url-policy';

export const createWebhookAction = formAction('token.manage', webhookCreateSchema, async (actor, input) => {
  const checked = await checkWebhookUrl(input.url, { allowPrivate: webhooksMayReachPrivate(getEnv()) });
  if (!checked.ok) throw new AppError(422, checked.message, 'invalid', { url: [checked.message] });
  const events: WebhookEvent[] = [];
  if (input.eventDone) events.push('analysis.done');
  if (input.eventFailed) events.push('analysis.failed');
  if (input.eventTarget) events.push('target.changed');
  const secret = `vmwh_${newSecret(24)}`;
  await createWebhook(actor.labId, actor.user.id, { url: checked.url.toString(), secret, events });
  revalidatePath('/settings/webhooks');
  return { message: 'Copy the signing secret now: it is shown only once.', secret };
});

export const deleteWebhookAction = formAction('token.manage', idOnlySchema, async (actor, input) => {
  if (!(await deleteWebhook(actor.labId, actor.user.id, input.id))) throw notFound('No such webhook');
  revalidatePath('/settings/webhooks');
  return 'Webhook removed';
});
