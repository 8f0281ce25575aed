import { NextResponse, type NextRequest } from 'next/server';
import { sessionUserId } from './lib/server/auth/session-token';
import { getEnv } from './lib/env';
import { servedOverHttps } from './lib/security/client-ip';
import { HSTS, newNonce, pageCsp } from './lib/security/headers';

// The first gate for pages only: visitors without a session go to sign-in. Every page and action
// still checks the role itself against the database. API routes are not matched: each handler
// answers 401/403 itself through withAuth (the authorization matrix tests every one without a
// session), and a second decode per call only slowed every read.
const PUBLIC = [/^\/sign-in/, /^\/sign-up/, /^\/invite\//, /^\/reset/, /^\/verify(\/|$)/, /^\/patterns\/show/];

export async function proxy(req: NextRequest) {
  const { pathname } = req.nextUrl;
  const env = getEnv();
  // every page gets a policy with its own nonce (lib/security/headers.ts); the request carries it
  // to the renderer, which stamps it on Next's scripts, and the answer carries it to the browser
  const nonce = newNonce();
  const csp = pageCsp(nonce, env.NODE_ENV === 'development');
  const https = servedOverHttps(req);
  const secure = (res: NextResponse): NextResponse => {
    res.headers.set('Content-Security-Policy', csp);
    if (https) res.headers.set('Strict-Transport-Security', HSTS);
    return res;
  };
  const next = () => {
    const headers = new Headers(req.headers);
    headers.set('x-nonce', nonce);
    headers.set('content-security-policy', csp);
    return secure(NextResponse.next({ request: { headers } }));
  };
  if (PUBLIC.some((re) => re.test(pathname))) return next();
  // the same decode (and memo) the handlers use; a token that decodes to no user is no session
  if (await sessionUserId(req.cookies, env.NEXTAUTH_URL.startsWith('https://'), env.NEXTAUTH_SECRET)) return next();
  const url = req.nextUrl.clone();
  url.pathname = '/sign-in';
  url.search = pathname === '/' ? '' : `?next=${encodeURIComponent(pathname + req.nextUrl.search)}`;
  return secure(NextResponse.redirect(url));
}

export const config = {
  // static files of public/ (icons, robots.txt, the web manifest) are for visitors without a session too
  matcher: ['/((?!api/|_next/static|_next/image|favicon.ico|.*\\.(?:png|svg|ico|woff2|txt|webmanifest)$).*)'],
};
