import 'server-only';
import { getServerSession } from 'next-auth';
import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { getMembership, getUserById, listMemberships, type Membership, type User } from '../../db/queries/users';
import { getEnv } from '../env';
import { AppError, forbidden, unauthorized } from '../errors';
import { getAuthOptions } from './options';
import { can, type Permission, type Role } from './permissions';

import { LAB_COOKIE } from './lab-cookie';

export { LAB_COOKIE };

/** Who is acting, in which lab, with which role: the role always comes from the database. */
export type Actor = { user: User; labId: string; labName: string; role: Role; memberships: Membership[] };

export async function getSessionUserId(): Promise<string | null> {
  const session = await getServerSession(getAuthOptions());
  const id = (session?.user as { id?: string } | undefined)?.id;
  return id ?? null;
}

/** The signed-in person's actor in the lab chosen by the lab cookie (or their first lab). */
export async function getActor(): Promise<Actor | null> {
  const userId = await getSessionUserId();
  if (!userId) return null;
  const user = await getUserById(userId);
  if (!user) return null;
  const memberships = await listMemberships(userId);
  const wanted = (await cookies()).get(LAB_COOKIE)?.value;
  const current = memberships.find((m) => m.labId === wanted) ?? memberships[0];
  if (!current) return null;
  return { user, labId: current.labId, labName: current.labName, role: current.role, memberships };
}

/** For pages: sends visitors without a session (or lab) to sign-in. */
export async function requireActor(): Promise<Actor> {
  const actor = await getActor();
  if (!actor) redirect('/sign-in');
  return actor;
}

/** For actions and handlers: throws 401 without a session and 403 without the permission. */
export async function actorWith(permission: Permission): Promise<Actor> {
  const actor = await getActor();
  if (!actor) throw unauthorized();
  if (!can(actor.role, permission)) throw forbidden();
  return actor;
}

export async function switchLab(userId: string, labId: string): Promise<void> {
  const membership = await getMembership(userId, labId);
  if (!membership) throw new AppError(404, 'No such lab');
  (await cookies()).set(LAB_COOKIE, labId, { httpOnly: true, sameSite: 'lax', path: '/', secure: getEnv().NEXTAUTH_URL.startsWith('https://') });
}
