import type { Knex } from 'knex';
import { getDb } from '../index';
import type { Role } from '../../lib/auth/permissions';
import { uuidSchema } from '../../lib/schemas/common';
import { projectVersionSql } from './trends';

export type User = { id: string; email: string; name: string; createdAt: Date };
export type UserWithHash = User & { passwordHash: string; emailVerified: boolean; sessionVersion: number };
export type Membership = { labId: string; labName: string; role: Role };

type UserRow = { id: string; email: string; name: string; password_hash: string; created_at: Date; email_verified_at: Date | null; session_version: number };

const toUser = (r: UserRow): UserWithHash => ({
  id: r.id,
  email: r.email,
  name: r.name,
  passwordHash: r.password_hash,
  createdAt: r.created_at,
  emailVerified: r.email_verified_at !== null,
  sessionVersion: r.session_version,
});

export async function getUserByEmail(email: string): Promise<UserWithHash | null> {
  const row = await getDb()<UserRow>('users').whereRaw('lower(email) = lower(?)', [email]).first();
  return row ? toUser(row) : null;
}

export async function getUserById(id: string): Promise<User | null> {
  const row = await getDb()<UserRow>('users').where({ id }).first();
  if (!row) return null;
  const { passwordHash: _omit, emailVerified: _v, sessionVersion: _s, ...user } = toUser(row);
  return user;
}

export async function listMemberships(userId: string): Promise<Membership[]> {
  const rows = await getDb()('memberships as m')
    .join('labs as l', 'l.id', 'm.lab_id')
    .where('m.user_id', userId)
    .orderBy([{ column: 'm.created_at' }, { column: 'l.name' }])
    .select<{ lab_id: string; name: string; role: Role }[]>('m.lab_id', 'l.name', 'm.role');
  return rows.map((r) => ({ labId: r.lab_id, labName: r.name, role: r.role }));
}

/**
 * A person and their memberships (oldest first, then by lab name, as listMemberships) in one
 * query: what every signed-in request needs. Null when the user is gone. Given a project id, each
 * membership row also carries that project's data version when the project is in that lab (what
 * `getProjectDataVersion` reads), so a cached project read needs no second query.
 */
export async function getUserWithMemberships(
  userId: string,
  projectId?: string,
): Promise<{ user: User; memberships: Membership[]; projectVersions: Map<string, string>; emailVerified: boolean; sessionVersion: number } | null> {
  const withProject = projectId !== undefined && uuidSchema.safeParse(projectId).success;
  const { rows } = await getDb().raw<{ rows: { id: string; email: string; name: string; created_at: Date; email_verified_at: Date | null; session_version: number; lab_id: string | null; lab_name: string | null; role: Role | null; project_version: string | null }[] }>(
    `SELECT u.id, u.email, u.name, u.created_at, u.email_verified_at, u.session_version, m.lab_id, l.name AS lab_name, m.role,
            ${withProject ? `(SELECT ${projectVersionSql('p')} FROM projects p WHERE p.id = ? AND p.lab_id = m.lab_id)` : 'NULL'} AS project_version
       FROM users u
       LEFT JOIN (memberships m JOIN labs l ON l.id = m.lab_id) ON m.user_id = u.id
      WHERE u.id = ?
      ORDER BY m.created_at, l.name`,
    withProject ? [projectId, userId] : [userId],
  );
  const first = rows[0];
  if (!first) return null;
  const user: User = { id: first.id, email: first.email, name: first.name, createdAt: first.created_at };
  const memberships = rows.flatMap((r) => (r.lab_id && r.lab_name !== null && r.role ? [{ labId: r.lab_id, labName: r.lab_name, role: r.role }] : []));
  const projectVersions = new Map(rows.flatMap((r) => (r.lab_id && r.project_version ? [[r.lab_id, r.project_version] as const] : [])));
  return { user, memberships, projectVersions, emailVerified: first.email_verified_at !== null, sessionVersion: first.session_version };
}

export async function getMembership(userId: string, labId: string): Promise<Membership | null> {
  const r = await getDb()('memberships as m')
    .join('labs as l', 'l.id', 'm.lab_id')
    .where({ 'm.user_id': userId, 'm.lab_id': labId })
    .first<{ lab_id: string; name: string; role: Role } | undefined>('m.lab_id', 'l.name', 'm.role');
  return r ? { labId: r.lab_id, labName: r.name, role: r.role } : null;
}

/**
 * Creates a person and a new lab whose admin they are, in one transaction. The address counts as
 * unproved (the person can only verify it) unless `emailVerified` says it was proved already.
 */
export async function createUserWithLab(input: { email: string; name: string; passwordHash: string; labName: string; emailVerified?: boolean }): Promise<{ userId: string; labId: string }> {
  return getDb().transaction(async (trx) => {
    const [user] = await trx('users')
      .insert({ email: input.email, name: input.name, password_hash: input.passwordHash, email_verified_at: input.emailVerified ? trx.fn.now() : null })
      .returning<{ id: string }[]>('id');
    const [lab] = await trx('labs').insert({ name: input.labName }).returning<{ id: string }[]>('id');
    if (!user || !lab) throw new Error('insert returned nothing');
    await trx('memberships').insert({ lab_id: lab.id, user_id: user.id, role: 'admin' });
    return { userId: user.id, labId: lab.id };
  });
}

/**
 * Ends every session of a person: session tokens carry the version they were issued under, and
 * one that no longer matches the row is no session (lib/server/auth/session.ts).
 */
export async function endSessions(userId: string, trx: Knex | Knex.Transaction = getDb()): Promise<void> {
  await trx('users').where({ id: userId }).update({ session_version: trx.raw('session_version + 1'), updated_at: trx.fn.now() });
}

/** The session version a token must carry to count, or null when the user is gone. */
export async function getSessionVersion(userId: string): Promise<number | null> {
  const row = await getDb()('users').where({ id: userId }).first<{ session_version: number } | undefined>('session_version');
  return row ? row.session_version : null;
}

/** Records that the person proved they read mail at their address. */
export async function markEmailVerified(userId: string, trx: Knex | Knex.Transaction = getDb()): Promise<void> {
  await trx('users').where({ id: userId }).whereNull('email_verified_at').update({ email_verified_at: trx.fn.now(), updated_at: trx.fn.now() });
}
