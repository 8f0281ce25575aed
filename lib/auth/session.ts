import 'server-only';
import { decode } from 'next-auth/jwt';
import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { getMembership, getUserWithMemberships, type Membership, type User } from '../../db/queries/users';
import { getEnv } from '../env';
import { AppError, forbidden, unauthorized } from '../errors';
import { getAuthOptions } from './options';
import { can, type Permission, type Role } from './permissions';

import { LAB_COOKIE } from './lab-cookie';

export { LAB_COOKIE };

/** Who is acting, in which lab, with which role: the role always comes from the database. */
export type Actor = { user: User; labId: string; labName: string; role: Role; memberships: Membership[] };

type CookieJar = Awaited<ReturnType<typeof cookies>>;

/**
 * The session token as next-auth stores it: one cookie, or several numbered chunks when long.
 * Mirrors next-auth's SessionStore so a chunked token reads back the same.
 */
function sessionToken(jar: CookieJar): string {
  const name = `${getAuthOptions().useSecureCookies ? '__Secure-' : ''}next-auth.session-token`;
  const suffix = (n: string) => parseInt(n.split('.').pop() ?? '0');
  return jar
    .getAll()
    .filter((c) => c.name.startsWith(name))
    .sort((a, b) => suffix(a.name) - suffix(b.name))
    .map((c) => c.value)
    .join('');
}

// jose's leeway on exp/nbf in next-auth's decode, repeated for tokens answered from memory
const CLOCK_TOLERANCE_S = 15;
const DECODED_MAX = 1000;
type Claims = { sub: string | null; exp?: number; nbf?: number };
const g = globalThis as unknown as { __veilmeterDecoded?: Map<string, Claims> };

/**
 * The signed-in user's id from the session JWT. getServerSession gives the same answer but runs
 * next-auth's whole session route per call (config checks, CSRF token, a re-encrypted token whose
 * cookie is then thrown away); decoding is all a handler needs, with the same secret and expiry
 * check. A decoded token is remembered by its exact text: the text is authenticated ciphertext,
 * so the same text always decodes to the same claims, and decoding (an HKDF key derivation and
 * an AES-GCM decryption) was the largest single cost of a cached read. Expiry is still checked
 * on every request.
 */
async function userIdFrom(jar: CookieJar): Promise<string | null> {
  const token = sessionToken(jar);
  if (!token) return null;
  const memo = (g.__veilmeterDecoded ??= new Map());
  let claims = memo.get(token);
  if (!claims) {
    try {
      const payload = await decode({ token, secret: getAuthOptions().secret as string });
      claims = { sub: typeof payload?.sub === 'string' && payload.sub ? payload.sub : null, exp: payload?.exp as number | undefined, nbf: payload?.nbf as number | undefined };
    } catch {
      return null;
    }
    if (memo.size >= DECODED_MAX) memo.delete(memo.keys().next().value as string);
    memo.set(token, claims);
  }
  const now = Math.floor(Date.now() / 1000);
  if (typeof claims.exp === 'number' && claims.exp <= now - CLOCK_TOLERANCE_S) {
    memo.delete(token);
    return null;
  }
  if (typeof claims.nbf === 'number' && claims.nbf > now + CLOCK_TOLERANCE_S) return null;
  return claims.sub;
}

export async function getSessionUserId(): Promise<string | null> {
  return userIdFrom(await cookies());
}

/** The signed-in person's actor in the lab chosen by the lab cookie (or their first lab). */
export async function getActor(): Promise<Actor | null> {
  const jar = await cookies();
  const userId = await userIdFrom(jar);
  if (!userId) return null;
  // one round trip: the user and their memberships, so the role is read fresh on every request
  const found = await getUserWithMemberships(userId);
  if (!found) return null;
  const { user, memberships } = found;
  const wanted = jar.get(LAB_COOKIE)?.value;
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
