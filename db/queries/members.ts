import type { Knex } from 'knex';
import { getDb } from '../index';
import { recordAudit } from './audit';
import { endSessions } from './users';
import type { Role } from '../../lib/auth/permissions';

export type Member = { userId: string; email: string; name: string; role: Role; since: Date };

export async function listMembers(labId: string): Promise<Member[]> {
  const rows = await getDb()('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where('m.lab_id', labId)
    .orderBy('u.name')
    .select<{ user_id: string; email: string; name: string; role: Role; created_at: Date }[]>('m.user_id', 'u.email', 'u.name', 'm.role', 'm.created_at');
  return rows.map((r) => ({ userId: r.user_id, email: r.email, name: r.name, role: r.role, since: r.created_at }));
}

export type MemberChange = 'ok' | 'not-found' | 'last-admin';

// Locks the lab's admin rows so two admins demoting each other at once cannot leave none.
async function adminCountLocked(trx: Knex.Transaction, labId: string): Promise<number> {
  const rows = await trx('memberships').where({ lab_id: labId, role: 'admin' }).forUpdate().select('user_id');
  return rows.length;
}

export async function changeMemberRole(labId: string, actorId: string, userId: string, role: Role): Promise<MemberChange> {
  return getDb().transaction(async (trx) => {
    const current = await trx('memberships').where({ lab_id: labId, user_id: userId }).forUpdate().first<{ role: Role } | undefined>('role');
    if (!current) return 'not-found';
    if (current.role === 'admin' && role !== 'admin' && (await adminCountLocked(trx, labId)) <= 1) return 'last-admin';
    await trx('memberships').where({ lab_id: labId, user_id: userId }).update({ role, updated_at: trx.fn.now() });
    await recordAudit({ labId, userId: actorId, action: 'member.role', targetType: 'user', targetId: userId, details: { from: current.role, to: role } }, trx);
    return 'ok';
  });
}

export async function removeMember(labId: string, actorId: string, userId: string): Promise<MemberChange> {
  return getDb().transaction(async (trx) => {
    const current = await trx('memberships').where({ lab_id: labId, user_id: userId }).forUpdate().first<{ role: Role } | undefined>('role');
    if (!current) return 'not-found';
    if (current.role === 'admin' && (await adminCountLocked(trx, labId)) <= 1) return 'last-admin';
    await trx('memberships').where({ lab_id: labId, user_id: userId }).delete();
    // out of every lab: their sessions end, so a later invitation does not revive an old token
    const left = await trx('memberships').where({ user_id: userId }).first('lab_id');
    if (!left) await endSessions(userId, trx);
    await recordAudit({ labId, userId: actorId, action: 'member.remove', targetType: 'user', targetId: userId, details: { role: current.role } }, trx);
    return 'ok';
  });
}
