import 'server-only';
import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { getMembership, getUserWithMemberships, type Membership, type User } from '../../../db/queries/users';
import { getEnv } from '../../env';
import { AppError, forbidden, unauthorized } from '../../errors';
import { getAuthOptions } from './options';
import { can, type Permission, type Role } from '../../auth/permissions';

import { LAB_COOKIE } from '../../auth/lab-cookie';
import { sessionClaims } from './session-token';

export { LAB_COOKIE };

/**
 * Who is acting, in which lab, with which role: the role always comes from the database. A handler
 * that names its project up front also gets that project's data version in this lab, read in the
 * same round trip (null: no such project in this lab; absent: not asked).
 */
export type Actor = { user: User; labId: string; labName: string; role: Role; memberships: Membership[]; project?: { id: string; version: string | null } };

type CookieJar = Awaited<ReturnType<typeof cookies>>;
type Found = NonNullable<Awaited<ReturnType<typeof getUserWithMemberships>>>;

// getServerSession gives the same answer but runs next-auth's whole session route per call (config
// checks, CSRF token, a re-encrypted token whose cookie is then thrown away); decoding is all a
// handler needs, with the same secret and expiry check.
function claimsFrom(jar: CookieJar): Promise<{ sub: string; sv: number } | null> {
  const options = getAuthOptions();
  return sessionClaims(jar, options.useSecureCookies === true, options.secret as string);
}

/**
 * The session's user and memberships in one round trip, or null: no token, the user is gone, or
 * the token's session version is not the user's current one (sessions ended by sign-out, a
 * password reset or removal from the last lab).
 */
async function lookUp(jar: CookieJar, projectId?: string): Promise<Found | null> {
  const claims = await claimsFrom(jar);
  if (!claims) return null;
  const found = await getUserWithMemberships(claims.sub, projectId);
  if (!found || found.sessionVersion !== claims.sv) return null;
  return found;
}

export async function getSessionUserId(): Promise<string | null> {
  return (await lookUp(await cookies()))?.user.id ?? null;
}

function actorOf(jar: CookieJar, found: Found, projectId?: string): Actor | null {
  const { user, memberships, projectVersions } = found;
  const wanted = jar.get(LAB_COOKIE)?.value;
  const current = memberships.find((m) => m.labId === wanted) ?? memberships[0];
  if (!current) return null;
  const actor: Actor = { user, labId: current.labId, labName: current.labName, role: current.role, memberships };
  if (projectId !== undefined) actor.project = { id: projectId, version: projectVersions.get(current.labId) ?? null };
  return actor;
}

/**
 * The signed-in person's actor in the lab chosen by the lab cookie (or their first lab). A person
 * whose address is not verified has no actor: they can only verify it (app/(auth)/verify).
 */
export async function getActor(projectId?: string): Promise<Actor | null> {
  const jar = await cookies();
  // one round trip: the user and their memberships, so the role is read fresh on every request
  const found = await lookUp(jar, projectId);
  if (!found || !found.emailVerified) return null;
  return actorOf(jar, found, projectId);
}

/** The signed-in person while their address is still unverified (null otherwise): what the verify page needs. */
export async function getUnverifiedUser(): Promise<User | null> {
  const found = await lookUp(await cookies());
  return found && !found.emailVerified ? found.user : null;
}

/** For pages: sends visitors without a session (or lab) to sign-in, and unverified ones to verify. */
export async function requireActor(): Promise<Actor> {
  const jar = await cookies();
  const found = await lookUp(jar);
  if (!found) redirect('/sign-in');
  if (!found.emailVerified) redirect('/verify');
  const actor = actorOf(jar, found);
  if (!actor) redirect('/sign-in');
  return actor;
}

/** For actions and handlers: throws 401 without a session, 403 before the address is verified or without the permission. */
export async function actorWith(permission: Permission, projectId?: string): Promise<Actor> {
  const jar = await cookies();
  const found = await lookUp(jar, projectId);
  if (!found) throw unauthorized();
  if (!found.emailVerified) throw new AppError(403, 'Confirm your e-mail address first: open the link we sent you, or ask for a new one on the sign-in page', 'unverified');
  const actor = actorOf(jar, found, projectId);
  if (!actor) throw unauthorized();
  if (!can(actor.role, permission)) throw forbidden();
  return actor;
}

export async function switchLab(userId: string, labId: string): Promise<void> {
  const membership = await getMembership(userId, labId);
  if (!membership) throw new AppError(404, 'No such lab');
  (await cookies()).set(LAB_COOKIE, labId, { httpOnly: true, sameSite: 'lax', path: '/', secure: getEnv().NEXTAUTH_URL.startsWith('https://') });
}
