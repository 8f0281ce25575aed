import type { Knex } from 'knex';
import { getDb } from '../index';
import { recordAudit } from './audit';
import type { Role } from '../../lib/auth/permissions';
import { hashSecret, newSecret } from '../../lib/security/tokens';

export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

export type Invitation = { id: string; email: string; role: Role; expiresAt: Date; acceptedAt: Date | null; revokedAt: Date | null; createdAt: Date; invitedBy: string | null };
type Row = { id: string; lab_id: string; email: string; role: Role; expires_at: Date; accepted_at: Date | null; revoked_at: Date | null; created_at: Date; inviter_name?: string | null };

const toInvitation = (r: Row): Invitation => ({ id: r.id, email: r.email, role: r.role, expiresAt: r.expires_at, acceptedAt: r.accepted_at, revokedAt: r.revoked_at, createdAt: r.created_at, invitedBy: r.inviter_name ?? null });

/** Creates an invitation and returns the one-time secret for its link (only the hash is stored). */
export async function createInvitation(labId: string, userId: string, email: string, role: Role): Promise<{ invitation: Invitation; token: string }> {
  const token = newSecret();
  return getDb().transaction(async (trx) => {
    // A newer invitation to the same address replaces the pending one.
    await trx('invitations').where({ lab_id: labId }).whereRaw('lower(email) = lower(?)', [email]).whereNull('accepted_at').whereNull('revoked_at').update({ revoked_at: trx.fn.now() });
    const [row] = await trx('invitations')
      .insert({ lab_id: labId, email, role, token_hash: hashSecret(token), invited_by: userId, expires_at: new Date(Date.now() + INVITATION_TTL_MS) })
      .returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'invitation.create', targetType: 'invitation', targetId: row.id, details: { email, role } }, trx);
    return { invitation: toInvitation(row), token };
  });
}

export async function listPendingInvitations(labId: string): Promise<Invitation[]> {
  const rows: Row[] = await getDb()('invitations as i')
    .leftJoin('users as u', 'u.id', 'i.invited_by')
    .where('i.lab_id', labId)
    .whereNull('i.accepted_at')
    .whereNull('i.revoked_at')
    .where('i.expires_at', '>', new Date())
    .orderBy('i.created_at', 'desc')
    .select('i.*', 'u.name as inviter_name');
  return rows.map(toInvitation);
}

export async function revokeInvitation(labId: string, userId: string, id: string): Promise<boolean> {
  return getDb().transaction(async (trx) => {
    const n = await trx('invitations').where({ lab_id: labId, id }).whereNull('accepted_at').whereNull('revoked_at').update({ revoked_at: trx.fn.now() });
    if (n) await recordAudit({ labId, userId, action: 'invitation.revoke', targetType: 'invitation', targetId: id }, trx);
    return n > 0;
  });
}

export type OpenInvitation = { id: string; labId: string; labName: string; email: string; role: Role; accountExists: boolean };

/** The invitation behind a link, if it is still usable. */
export async function findOpenInvitation(token: string, trx: Knex | Knex.Transaction = getDb()): Promise<OpenInvitation | null> {
  const r = await trx('invitations as i')
    .join('labs as l', 'l.id', 'i.lab_id')
    .where('i.token_hash', hashSecret(token))
    .whereNull('i.accepted_at')
    .whereNull('i.revoked_at')
    .where('i.expires_at', '>', new Date())
    .first<{ id: string; lab_id: string; name: string; email: string; role: Role } | undefined>('i.id', 'i.lab_id', 'l.name', 'i.email', 'i.role');
  if (!r) return null;
  const user = await trx('users').whereRaw('lower(email) = lower(?)', [r.email]).first('id');
  return { id: r.id, labId: r.lab_id, labName: r.name, email: r.email, role: r.role, accountExists: !!user };
}

/**
 * Accepts once: the row is locked and marked in one transaction, so a second use of the same
 * link fails. `join` adds the lab to the user (existing or new); returns null if the link is spent.
 */
export async function acceptInvitation(token: string, join: (trx: Knex.Transaction, inv: OpenInvitation) => Promise<string>): Promise<{ userId: string; labId: string } | null> {
  return getDb().transaction(async (trx) => {
    const locked = await trx('invitations').where({ token_hash: hashSecret(token) }).forUpdate().first('id');
    if (!locked) return null;
    const inv = await findOpenInvitation(token, trx);
    if (!inv) return null;
    const userId = await join(trx, inv);
    await trx('memberships').insert({ lab_id: inv.labId, user_id: userId, role: inv.role }).onConflict(['lab_id', 'user_id']).merge({ role: inv.role, updated_at: trx.fn.now() });
    await trx('invitations').where({ id: inv.id }).update({ accepted_at: trx.fn.now() });
    await recordAudit({ labId: inv.labId, userId, action: 'invitation.accept', targetType: 'invitation', targetId: inv.id, details: { role: inv.role } }, trx);
    return { userId, labId: inv.labId };
  });
}
