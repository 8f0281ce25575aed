import type { Knex } from 'knex';
import { getDb } from '../index';

export type AuditInput = {
  labId: string | null;
  userId: string | null;
  action: string;
  targetType?: string;
  targetId?: string;
  details?: Record<string, unknown>;
  ip?: string | null;
};

export async function recordAudit(e: AuditInput, trx: Knex | Knex.Transaction = getDb()): Promise<void> {
  await trx('audit_events').insert({
    lab_id: e.labId,
    user_id: e.userId,
    action: e.action,
    target_type: e.targetType ?? null,
    target_id: e.targetId ?? null,
    details: JSON.stringify(e.details ?? {}),
    ip: e.ip ?? null,
  });
}

export type AuditEvent = { id: string; action: string; targetType: string | null; targetId: string | null; details: Record<string, unknown>; createdAt: Date; userEmail: string | null };

export async function listAuditEvents(labId: string, limit = 200): Promise<AuditEvent[]> {
  const rows = await getDb()('audit_events as a')
    .leftJoin('users as u', 'u.id', 'a.user_id')
    .where('a.lab_id', labId)
    .orderBy('a.created_at', 'desc')
    .limit(limit)
    .select('a.id', 'a.action', 'a.target_type', 'a.target_id', 'a.details', 'a.created_at', 'u.email');
  return rows.map((r) => ({ id: String(r.id), action: r.action, targetType: r.target_type, targetId: r.target_id, details: r.details, createdAt: r.created_at, userEmail: r.email }));
}
