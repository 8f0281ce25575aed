import { getEnv } from '../env';
import { AppError } from '../errors';

const WRITES = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
// next-auth's session cookie, plain or __Secure- prefixed, whole or split into chunks
const SESSION_COOKIE = /(?:^|;\s*)(?:__Secure-)?next-auth\.session-token(?:\.\d+)?=/;

/** The origin the app is served from (scheme, host and port of NEXTAUTH_URL). */
export function appOrigin(): string {
  return new URL(getEnv().NEXTAUTH_URL).origin;
}

/**
 * A write that rides on the session cookie must come from a page of this app: browsers send
 * Origin with every POST, PUT, PATCH and DELETE, so a missing or foreign one is a request another
 * site (or a script holding a stolen cookie) made. SameSite=Lax alone lets a sibling subdomain or
 * a top-level form post through. Requests without the session cookie are not checked here: they
 * have no session to abuse, and bearer-token calls under /api/v1 never read the cookie.
 */
export function assertSameOrigin(req: Request): void {
  if (!WRITES.has(req.method.toUpperCase())) return;
  if (!SESSION_COOKIE.test(req.headers.get('cookie') ?? '')) return;
  const origin = req.headers.get('origin');
  if (origin && origin === appOrigin()) return;
  throw new AppError(403, origin ? 'This request came from another site and was refused' : 'This request carried no Origin header and was refused: send it from the app, or use an API token under /api/v1', 'cross_origin');
}
