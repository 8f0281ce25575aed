import { NextResponse, type NextRequest } from 'next/server';
import { sessionUserId } from './lib/auth/session-token';
import { getEnv } from './lib/env';

// The first gate for pages only: visitors without a session go to sign-in. Every page and action
// still checks the role itself against the database. API routes are not matched: each handler
// answers 401/403 itself through withAuth (the authorization matrix tests every one without a
// session), and a second decode per call only slowed every read.
const PUBLIC = [/^\/sign-in/, /^\/sign-up/, /^\/invite\//, /^\/reset/, /^\/verify(\/|$)/, /^\/patterns\/show/];

export async function proxy(req: NextRequest) {
  const { pathname } = req.nextUrl;
  if (PUBLIC.some((re) => re.test(pathname))) return NextResponse.next();
  const env = getEnv();
  // the same decode (and memo) the handlers use; a token that decodes to no user is no session
  if (await sessionUserId(req.cookies, env.NEXTAUTH_URL.startsWith('https://'), env.NEXTAUTH_SECRET)) return NextResponse.next();
  const url = req.nextUrl.clone();
  url.pathname = '/sign-in';
  url.search = pathname === '/' ? '' : `?next=${encodeURIComponent(pathname + req.nextUrl.search)}`;
  return NextResponse.redirect(url);
}

export const config = {
  // static files of public/ (icons, robots.txt, the web manifest) are for visitors without a session too
  matcher: ['/((?!api/|_next/static|_next/image|favicon.ico|.*\\.(?:png|svg|ico|woff2|txt|webmanifest)$).*)'],
};
