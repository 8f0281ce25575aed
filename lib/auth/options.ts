import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { getUserByEmail, listMemberships } from '../../db/queries/users';
import { recordAudit } from '../../db/queries/audit';
import { getEnv } from '../env';
import { signInSchema } from '../schemas/user';
import { verifyNothing, verifyPassword } from './password';

export const SESSION_MAX_AGE_S = 12 * 60 * 60;

let cached: NextAuthOptions | undefined;

/** next-auth settings: e-mail + password, JWT sessions holding only the user id. */
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
          return { id: user.id, email: user.email, name: user.name };
        },
      }),
    ],
    callbacks: {
      jwt({ token, user }) {
        if (user) token.sub = user.id;
        return token;
      },
      session({ session, token }) {
        if (session.user && token.sub) (session.user as { id?: string }).id = token.sub;
        return session;
      },
    },
  };
  return cached;
}
