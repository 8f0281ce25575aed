import { getDb } from '../index';
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
