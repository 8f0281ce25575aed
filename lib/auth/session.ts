import 'server-only';
import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { getMembership, getUserWithMemberships, type Membership, type User } from '../../db/queries/users';
import { getEnv } from '../env';
import { AppError, forbidden, unauthorized } from '../errors';
import { getAuthOptions } from './options';
import { can, type Permission, type Role } from './permissions';

import { LAB_COOKIE } from './lab-cookie';
import { sessionUserId } from './session-token';

export { LAB_COOKIE };

/**
 * Who is acting, in which lab, with which role: the role always comes from the database. A handler
 * that names its project up front also gets that project's data version in this lab, read in the
 * same round trip (null: no such project in this lab; absent: not asked).
 */
export type Actor = { user: User; labId: string; labName: string; role: Role; memberships: Membership[]; project?: { id: string; version: string | null } };

type CookieJar = Awaited<ReturnType<typeof cookies>>;

// getServerSession gives the same answer but runs next-auth's whole session route per call (config
// checks, CSRF token, a re-encrypted token whose cookie is then thrown away); decoding is all a
// handler needs, with the same secret and expiry check.
function userIdFrom(jar: CookieJar): Promise<string | null> {
  const options = getAuthOptions();
  return sessionUserId(jar, options.useSecureCookies === true, options.secret as string);
}

export async function getSessionUserId(): Promise<string | null> {
  return userIdFrom(await cookies());
}

/** The signed-in person's actor in the lab chosen by the lab cookie (or their first lab). */
export async function getActor(projectId?: string): Promise<Actor | null> {
  const jar = await cookies();
  const userId = await userIdFrom(jar);
  if (!userId) return null;
  // one round trip: the user and their memberships, so the role is read fresh on every request
  const found = await getUserWithMemberships(userId, projectId);
  if (!found) return null;
  const { user, memberships, projectVersions } = found;
  const wanted = jar.get(LAB_COOKIE)?.value;
  const current = memberships.find((m) => m.labId === wanted) ?? memberships[0];
  if (!current) return null;
  const actor: Actor = { user, labId: current.labId, labName: current.labName, role: current.role, memberships };
  if (projectId !== undefined) actor.project = { id: projectId, version: projectVersions.get(current.labId) ?? null };
  return actor;
}

/** For pages: sends visitors without a session (or lab) to sign-in. */
export async function requireActor(): Promise<Actor> {
  const actor = await getActor();
  if (!actor) redirect('/sign-in');
  return actor;
}

/** For actions and handlers: throws 401 without a session and 403 without the permission. */
export async function actorWith(permission: Permission, projectId?: string): Promise<Actor> {
  const actor = await getActor(projectId);
  if (!actor) throw unauthorized();
  if (!can(actor.role, permission)) throw forbidden();
  return actor;
}

export async function switchLab(userId: string, labId: string): Promise<void> {
  const membership = await getMembership(userId, labId);
  if (!membership) throw new AppError(404, 'No such lab');
  (await cookies()).set(LAB_COOKIE, labId, { httpOnly: true, sameSite: 'lax', path: '/', secure: getEnv().NEXTAUTH_URL.startsWith('https://') });
}
