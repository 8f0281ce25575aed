import { NextResponse, type NextRequest } from 'next/server';
import { sessionUserId } from './lib/auth/session-token';
import { getEnv } from './lib/env';

// The first gate only: visitors without a session go to sign-in. Every page, action and
// handler still checks the role itself against the database.
const PUBLIC = [/^\/sign-in/, /^\/sign-up/, /^\/invite\//, /^\/reset/, /^\/api\/auth\//, /^\/api\/health$/, /^\/api\/password-reset/, /^\/api\/patterns\//, /^\/api\/v1\//, /^\/patterns\/show/];

export async function proxy(req: NextRequest) {
  const { pathname } = req.nextUrl;
  if (PUBLIC.some((re) => re.test(pathname))) return NextResponse.next();
  const env = getEnv();
  // the same decode (and memo) the handlers use; a token that decodes to no user is no session
  if (await sessionUserId(req.cookies, env.NEXTAUTH_URL.startsWith('https://'), env.NEXTAUTH_SECRET)) return NextResponse.next();
  if (pathname.startsWith('/api/')) {
    return NextResponse.json({ error: { code: 'unauthorized', message: 'Sign in first' } }, { status: 401 });
  }
  const url = req.nextUrl.clone();
  url.pathname = '/sign-in';
  url.search = pathname === '/' ? '' : `?next=${encodeURIComponent(pathname + req.nextUrl.search)}`;
  return NextResponse.redirect(url);
}

export const config = {
  matcher: ['/((?!_next/static|_next/image|favicon.ico|.*\\.(?:png|svg|ico|woff2)$).*)'],
};
