import { getDb } from '../index';
import { recordAudit } from './audit';

export const WEBHOOK_EVENTS = ['analysis.done', 'analysis.failed', 'target.changed'] as const;
export type WebhookEvent = (typeof WEBHOOK_EVENTS)[number];

export type Webhook = { id: string; url: string; events: WebhookEvent[]; createdAt: Date; delivered: number; failed: number; pending: number; lastError: string | null };

export async function createWebhook(labId: string, userId: string, input: { url: string; secret: string; events: WebhookEvent[] }): Promise<{ id: string }> {
  return getDb().transaction(async (trx) => {
    const [row] = await trx('webhooks').insert({ lab_id: labId, url: input.url, secret: input.secret, events: input.events, created_by: userId }).returning<{ id: string }[]>('id');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'webhook.create', targetType: 'webhook', targetId: row.id, details: { url: input.url, events: input.events } }, trx);
    return row;
  });
}

export async function listWebhooks(labId: string): Promise<Webhook[]> {
  const db = getDb();
  const rows = (await db('webhooks as w')
    .where('w.lab_id', labId)
    .orderBy('w.created_at')
    .select(
      'w.id',
      'w.url',
      'w.events',
      'w.created_at',
      db.raw(`(SELECT count(*) FROM webhook_deliveries d WHERE d.webhook_id = w.id AND d.status = 'delivered') AS delivered`),
      db.raw(`(SELECT count(*) FROM webhook_deliveries d WHERE d.webhook_id = w.id AND d.status = 'failed') AS failed`),
      db.raw(`(SELECT count(*) FROM webhook_deliveries d WHERE d.webhook_id = w.id AND d.status = 'pending') AS pending`),
      db.raw(`(SELECT d.last_error FROM webhook_deliveries d WHERE d.webhook_id = w.id AND d.last_error IS NOT NULL ORDER BY d.created_at DESC LIMIT 1) AS last_error`),
    )) as { id: string; url: string; events: WebhookEvent[]; created_at: Date; delivered: string; failed: string; pending: string; last_error: string | null }[];
  return rows.map((r) => ({ id: r.id, url: r.url, events: r.events, createdAt: r.created_at, delivered: Number(r.delivered), failed: Number(r.failed), pending: Number(r.pending), lastError: r.last_error }));
}

export async function deleteWebhook(labId: string, userId: string, id: string): Promise<boolean> {
  return getDb().transaction(async (trx) => {
    const n = await trx('webhooks').where({ lab_id: labId, id }).delete();
    if (n) await recordAudit({ labId, userId, action: 'webhook.delete', targetType: 'webhook', targetId: id }, trx);
    return n > 0;
  });
}

export type DeliveryToSend = { id: string; labId: string; event: string; payload: unknown; createdAt: Date; attempts: number; status: string; url: string; secret: string };

/** A delivery with its webhook's address and key (null when either is gone). */
export async function getDelivery(labId: string, id: string): Promise<DeliveryToSend | null> {
  const row = (await getDb()('webhook_deliveries as d')
    .join('webhooks as w', 'w.id', 'd.webhook_id')
    .where({ 'd.lab_id': labId, 'd.id': id })
    .first('d.id', 'd.lab_id', 'd.event', 'd.payload', 'd.created_at', 'd.attempts', 'd.status', 'w.url', 'w.secret')) as
    | { id: string; lab_id: string; event: string; payload: unknown; created_at: Date; attempts: number; status: string; url: string; secret: string }
    | undefined;
  return row ? { id: row.id, labId: row.lab_id, event: row.event, payload: row.payload, createdAt: row.created_at, attempts: row.attempts, status: row.status, url: row.url, secret: row.secret } : null;
}

/** Pending deliveries, oldest first, across labs (the worker's sweep enqueues them). */
export async function listPendingDeliveries(limit = 200): Promise<{ id: string; labId: string }[]> {
  const rows = (await getDb()('webhook_deliveries').where({ status: 'pending' }).orderBy('created_at').limit(limit).select('id', 'lab_id')) as { id: string; lab_id: string }[];
  return rows.map((r) => ({ id: r.id, labId: r.lab_id }));
}

export async function recordDeliveryAttempt(labId: string, id: string, outcome: { ok: boolean; final: boolean; status: number | null; error: string | null }): Promise<void> {
  const db = getDb();
  await db('webhook_deliveries')
    .where({ lab_id: labId, id })
    .update({
      attempts: db.raw('attempts + 1'),
      last_status: outcome.status,
      last_error: outcome.ok ? null : outcome.error,
      status: outcome.ok ? 'delivered' : outcome.final ? 'failed' : 'pending',
      delivered_at: outcome.ok ? db.fn.now() : null,
    });
}
