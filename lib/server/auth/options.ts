import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { endSessions, getSessionVersion, getUserByEmail, listMemberships } from '../../../db/queries/users';
import { recordAudit } from '../../../db/queries/audit';
import { getEnv } from '../../env';
import { signInSchema } from '../../schemas/user';
import { verifyNothing, verifyPassword } from '../../auth/password';
import { sameOriginPath } from '../../auth/safe-next';

export const SESSION_MAX_AGE_S = 12 * 60 * 60;

let cached: NextAuthOptions | undefined;

/**
 * next-auth settings: e-mail + password, JWT sessions holding the user id and the session version
 * (users.session_version) they were issued under; lib/server/auth/session.ts refuses a token whose
 * version is no longer the user's.
 */
export function getAuthOptions(): NextAuthOptions {
  if (cached) return cached;
  const env = getEnv();
  cached = {
    secret: env.NEXTAUTH_SECRET,
    session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_S },
    pages: { signIn: '/sign-in', error: '/sign-in' },
    useSecureCookies: env.NEXTAUTH_URL.startsWith('https://'),
    providers: [
      CredentialsProvider({
        name: 'E-mail and password',
        credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
        async authorize(credentials) {
          const parsed = signInSchema.safeParse(credentials ?? {});
          if (!parsed.success) return null;
          const user = await getUserByEmail(parsed.data.email);
          if (!user) return verifyNothing(parsed.data.password).then(() => null);
          if (!(await verifyPassword(parsed.data.password, user.passwordHash))) return null;
          for (const m of await listMemberships(user.id)) await recordAudit({ labId: m.labId, userId: user.id, action: 'auth.sign-in' });
          return { id: user.id, email: user.email, name: user.name, sv: user.sessionVersion };
        },
      }),
    ],
    callbacks: {
      jwt({ token, user }) {
        if (user) {
          token.sub = user.id;
          token.sv = (user as { sv?: number }).sv ?? 0;
        }
        return token;
      },
      // only this origin: a callbackUrl of another host (or one no URL parser accepts, which
      // next-auth's own check would throw on) goes to the start page
      redirect({ url, baseUrl }) {
        const path = sameOriginPath(url, baseUrl);
        return path ? `${baseUrl}${path}` : baseUrl;
      },
      session({ session, token }) {
        if (session.user && token.sub) (session.user as { id?: string }).id = token.sub;
        return session;
      },
    },
    events: {
      // Signing out ends every session of the person (see DEVELOPERS.md, "Sessions"): a copy of
      // the token kept elsewhere stops working too. A token already ended changes nothing.
      async signOut({ token }) {
        const sub = typeof token?.sub === 'string' ? token.sub : null;
        if (!sub) return;
        const sv = typeof token.sv === 'number' ? token.sv : 0;
        if ((await getSessionVersion(sub)) === sv) await endSessions(sub);
      },
    },
  };
  return cached;
}
